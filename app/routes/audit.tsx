import { useMemo } from "react";
import {
  Link,
  useSearchParams,
  type ShouldRevalidateFunctionArgs,
} from "react-router";
import { auditFilterOptions } from "~/audit/audit-trail.server";
import { auditKindLabels, auditKinds, isAuditKind } from "~/audit/kinds";
import { requirePermission } from "~/auth/page-access.server";
import { AuditGrid } from "~/components/audit/audit-grid";
import {
  auditQuery,
  useAuditEntries,
  type AuditFilterName,
} from "~/components/audit/use-audit";
import { SiteOptions } from "~/components/options";
import {
  Button,
  Card,
  cx,
  EmptyState,
  Field,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import { useHydrated } from "~/lib/use-hydrated";
import { useUrlFilters } from "~/lib/use-url-filters";
import { carrierLabels, carriers } from "~/sites/meter-schema";
import type { Route } from "./+types/audit";

export const meta: Route.MetaFunction = () => [
  { title: "Audit trail · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "audit.view");
  return {
    organization,
    ...(await auditFilterOptions(organization.id)),
  };
}

// The filters live in the URL and the entries are fetched by the page, so a
// change of filter needs no new loader data.
export function shouldRevalidate({
  currentUrl,
  nextUrl,
  defaultShouldRevalidate,
}: ShouldRevalidateFunctionArgs) {
  if (currentUrl.pathname === nextUrl.pathname) return false;
  return defaultShouldRevalidate;
}

type LoaderData = Route.ComponentProps["loaderData"];

const DAY = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;
const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

const linkButton =
  "inline-flex min-h-10 items-center justify-center rounded-lg bg-surface px-4 text-[15px] font-semibold text-ink ring-1 ring-inset ring-line-strong";

function monthName(month: string): string {
  const [y, m] = month.split("-").map(Number);
  return new Intl.DateTimeFormat("en-GB", {
    month: "long",
    year: "numeric",
    timeZone: "UTC",
  }).format(new Date(Date.UTC(y, m - 1, 1)));
}

/**
 * The filters as asked for in the URL, kept only where they make sense:
 * an id that is not one of this organisation's options is not used.
 */
function useFilters(options: LoaderData) {
  const [get, set] = useUrlFilters();
  const oneOf = (name: string, ids: readonly string[]) => {
    const value = get(name);
    return ids.includes(value) ? value : "";
  };
  const site = oneOf(
    "site",
    options.sites.map((s) => s.id),
  );
  const meters = site
    ? options.meters.filter((m) => m.siteId === site)
    : options.meters;
  const kind = get("kind");
  const carrier = get("carrier");
  const since = get("since");
  const values: Record<AuditFilterName, string> = {
    site,
    meter: oneOf(
      "meter",
      meters.map((m) => m.id),
    ),
    person: oneOf(
      "person",
      options.people.map((p) => p.id),
    ),
    kind: isAuditKind(kind) ? kind : "",
    from: get("from"),
    to: get("to"),
    month: MONTH.test(get("month")) ? get("month") : "",
    carrier: (carriers as readonly string[]).includes(carrier) ? carrier : "",
    since: Number.isNaN(Date.parse(since)) ? "" : since,
  };
  return { values, meters, set };
}

function periodErrors(from: string, to: string) {
  const fromError =
    from && !DAY.test(from) ? "Use a day like 2026-01-31." : undefined;
  const toError =
    to && !DAY.test(to)
      ? "Use a day like 2026-01-31."
      : from && to && !fromError && to < from
        ? "The last day comes before the first."
        : undefined;
  return { fromError, toError };
}

/** The Ledger's link to a closed month's adjusting entries, said in words. */
function LedgerScope({
  values,
  siteName,
  onClear,
}: {
  values: Record<AuditFilterName, string>;
  siteName: string | undefined;
  onClear: () => void;
}) {
  if (!values.month && !values.carrier && !values.since) return null;
  const closed = values.since
    ? new Intl.DateTimeFormat("en-GB", {
        dateStyle: "medium",
        timeStyle: "short",
      }).format(new Date(values.since))
    : null;
  return (
    <Notice title="From the Ledger">
      Showing{" "}
      {values.kind === "adjustment" ? "the adjusting entries" : "entries"}
      {values.carrier
        ? ` to ${carrierLabels[values.carrier as (typeof carriers)[number]].toLowerCase()}`
        : ""}
      {siteName ? ` at ${siteName}` : ""}
      {values.month ? ` for ${monthName(values.month)}` : ""}
      {closed ? `, made since the month was closed (${closed})` : ""}.{" "}
      <button
        type="button"
        onClick={onClear}
        className="font-semibold underline"
      >
        Show all entries
      </button>
    </Notice>
  );
}

function Filters({
  options,
  meters,
  values,
  set,
}: {
  options: LoaderData;
  meters: LoaderData["meters"];
  values: Record<AuditFilterName, string>;
  set: (name: string, value: string) => void;
}) {
  const { fromError, toError } = periodErrors(values.from, values.to);
  return (
    <div className="grid gap-4 sm:grid-cols-3 lg:grid-cols-6 lg:items-start">
      <SelectField
        label="Site"
        name="site"
        value={values.site}
        onChange={(e) => set("site", e.target.value)}
      >
        <option value="">All sites</option>
        <SiteOptions sites={options.sites} />
      </SelectField>
      <SelectField
        label="Meter"
        name="meter"
        value={values.meter}
        onChange={(e) => set("meter", e.target.value)}
      >
        <option value="">All meters</option>
        {meters.map((m) => (
          <option key={m.id} value={m.id}>
            {m.code} · {m.name}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Person"
        name="person"
        value={values.person}
        onChange={(e) => set("person", e.target.value)}
      >
        <option value="">Everyone</option>
        {options.people.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Kind of change"
        name="kind"
        value={values.kind}
        onChange={(e) => set("kind", e.target.value)}
      >
        <option value="">Every kind</option>
        {auditKinds.map((k) => (
          <option key={k} value={k}>
            {auditKindLabels[k]}
          </option>
        ))}
      </SelectField>
      <Field
        label="From day"
        name="from"
        type="date"
        value={values.from}
        max={DAY.test(values.to) ? values.to : undefined}
        onChange={(e) => set("from", e.target.value)}
        error={fromError}
      />
      <Field
        label="To day"
        name="to"
        type="date"
        value={values.to}
        min={DAY.test(values.from) ? values.from : undefined}
        onChange={(e) => set("to", e.target.value)}
        error={toError}
      />
    </div>
  );
}

export default function AuditTrailPage({ loaderData }: Route.ComponentProps) {
  const { organization } = loaderData;
  const { values, meters, set } = useFilters(loaderData);
  const [, setParams] = useSearchParams();
  // The grid and the reader's time zone exist in the browser only.
  const mounted = useHydrated();
  const timeZone = useMemo(
    () => (mounted ? Intl.DateTimeFormat().resolvedOptions().timeZone : "UTC"),
    [mounted],
  );
  const { fromError, toError } = periodErrors(values.from, values.to);
  const query = fromError || toError ? null : auditQuery(values, timeZone);
  const { entries, error, loading, hasOlder, loadingMore, loadOlder } =
    useAuditEntries(organization.id, mounted ? query : null);
  const siteName = loaderData.sites.find((s) => s.id === values.site)?.name;
  const clearLedgerScope = () => {
    const next = new URLSearchParams(auditQuery(values, timeZone));
    for (const name of ["month", "carrier", "since", "tz"]) next.delete(name);
    setParams(next, { replace: true });
  };

  return (
    <>
      <PageHeader
        title="Audit trail"
        description={`Every change in ${organization.name}: who made it, when, why, and what it was before and after.`}
        actions={
          <a
            href={
              query === null
                ? undefined
                : `/api/v1/orgs/${organization.id}/audit.csv?${query}`
            }
            aria-disabled={query === null ? "true" : undefined}
            download
            className={cx(
              linkButton,
              query === null
                ? "cursor-not-allowed text-ink-faint"
                : "hover:bg-sunken",
            )}
          >
            Export CSV
          </a>
        }
      />
      <div className="flex flex-col gap-6">
        <LedgerScope
          values={values}
          siteName={siteName}
          onClear={clearLedgerScope}
        />
        <Card aria-labelledby="filters-heading">
          <h2 id="filters-heading" className="sr-only">
            Filters
          </h2>
          <Filters
            options={loaderData}
            meters={meters}
            values={values}
            set={set}
          />
          <p className="mt-3 text-sm text-ink-muted" role="status">
            {loading
              ? "Loading…"
              : query !== null && !error
                ? `${entries.length.toLocaleString("en-GB")} ${entries.length === 1 ? "entry" : "entries"}${hasOlder ? " so far" : ""}, newest first`
                : ""}
          </p>
          {error ? (
            <div className="mt-3">
              <Notice tone="error">{error}</Notice>
            </div>
          ) : null}
        </Card>
        {!loading && !error && query !== null && entries.length === 0 ? (
          <EmptyState title="No changes match these filters">
            Changes appear here as people correct hours, close months, look
            after meters, gateways and members, and as billing changes.
          </EmptyState>
        ) : null}
        {mounted && entries.length > 0 ? (
          <Card aria-labelledby="entries-heading">
            <h2 id="entries-heading" className="text-lg">
              Changes
            </h2>
            <div className="mt-3">
              <AuditGrid entries={entries} />
            </div>
            {hasOlder ? (
              <div className="mt-4">
                <Button
                  variant="secondary"
                  disabled={loadingMore}
                  onClick={() => void loadOlder()}
                >
                  {loadingMore ? "Loading…" : "Show older changes"}
                </Button>
              </div>
            ) : null}
            <p className="mt-3 text-sm text-ink-muted">
              Times are in your browser's time zone ({timeZone}); the CSV gives
              them in UTC. Meters, sites and people are named as they are now.
            </p>
          </Card>
        ) : null}
        <p className="text-sm text-ink-muted">
          Adjusting entries also appear in the{" "}
          <Link
            to={`/o/${organization.id}/ledger`}
            className="font-semibold text-spruce-700 underline"
          >
            Ledger
          </Link>{" "}
          beside the closed month they change.
        </p>
      </div>
    </>
  );
}
