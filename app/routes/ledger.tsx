import { monthCount, monthKey } from "~/lib/months";
import { useHydrated } from "~/lib/use-hydrated";
import { useUrlFilters } from "~/lib/use-url-filters";
import { useEffect, useMemo, useRef, type ReactNode } from "react";
import {
  data,
  Form,
  useNavigation,
  type ShouldRevalidateFunctionArgs,
} from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import { LedgerGrid } from "~/components/ledger/ledger-grid";
import {
  exportQuery,
  ledgerQuery,
  useLedger,
  type LedgerRow,
} from "~/components/ledger/use-ledger";
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
import { isLedgerUnit, ledgerUnits } from "~/ledger/ledger-units";
import { closeMonth, reopenMonth } from "~/ledger/month-close.server";
import { parseForm } from "~/lib/forms";
import { carrierLabels, carriers } from "~/sites/meter-schema";
import { getSite, listSites } from "~/sites/sites.server";
import type { Route } from "./+types/ledger";

export const meta: Route.MetaFunction = () => [{ title: "Ledger · Joulebook" }];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "ledger.view");
  return {
    organization,
    canClose: can(role, "months.close"),
    canReopen: can(role, "months.reopen"),
    canOpenAudit: can(role, "audit.view"),
    sites: await listSites({ organizationId: organization.id }),
  };
}

// The filters live in the URL and the figures are fetched by the page, so a
// change of filter needs no new loader data.
export function shouldRevalidate({
  currentUrl,
  nextUrl,
  formMethod,
  defaultShouldRevalidate,
}: ShouldRevalidateFunctionArgs) {
  if (!formMethod && currentUrl.pathname === nextUrl.pathname) return false;
  return defaultShouldRevalidate;
}

const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

const monthField = z
  .string()
  .trim()
  .regex(MONTH, "Choose a month, like 2025-01.");
const siteField = z.union([z.literal(""), z.uuid()], {
  error: "Choose a site from the list, or the whole organisation.",
});

const closeSchema = z.strictObject({
  intent: z.literal("close", { error: "Unknown action." }),
  month: monthField,
  siteId: siteField,
});
const reopenSchema = z.strictObject({
  intent: z.literal("reopen"),
  month: monthField,
  siteId: siteField,
  reason: z
    .string()
    .trim()
    .min(5, "Say why, in at least 5 characters: it goes to the audit log.")
    .max(500, "Use at most 500 characters."),
});

type Result = {
  intent: string;
  errors: Record<string, string>;
  message?: string;
};

function monthName(month: string): string {
  const [y, m] = month.split("-").map(Number);
  return new Intl.DateTimeFormat("en-GB", {
    month: "long",
    year: "numeric",
    timeZone: "UTC",
  }).format(new Date(Date.UTC(y, m - 1, 1)));
}

export async function action({ request, context }: Route.ActionArgs) {
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const reopening = intent === "reopen";
  const { organization, user } = requirePermission(
    context,
    reopening ? "months.reopen" : "months.close",
  );
  const form = reopening
    ? parseForm(formData, reopenSchema)
    : parseForm(formData, closeSchema);
  if (!form.ok) {
    const { intent: unknown, ...errors } = form.errors;
    if (unknown) errors.form ??= unknown;
    return data<Result>({ intent, errors }, { status: 400 });
  }
  const { month, siteId } = form.data;
  const site = siteId
    ? await getSite({ organizationId: organization.id, siteId })
    : null;
  if (siteId && !site)
    return data<Result>(
      { intent, errors: { siteId: "Choose a site from the list." } },
      { status: 400 },
    );
  const scope = {
    organizationId: organization.id,
    actorUserId: user.id,
    month,
    siteId: siteId || null,
  };
  const result =
    form.data.intent === "reopen"
      ? await reopenMonth({ ...scope, reason: form.data.reason })
      : await closeMonth(scope);
  if (!result.ok)
    return data<Result>(
      { intent, errors: { form: result.reason } },
      { status: 409 },
    );
  const where = site ? site.name : "the whole organisation";
  return data<Result>({
    intent,
    errors: {},
    message: reopening
      ? `${monthName(month)} is open again for ${where}; the reason is in the audit log.`
      : `${monthName(month)} is closed for ${where}. Later corrections appear as adjustments.`,
  });
}

/** The ledger API answers at most ten years at a time. */
const MAX_MONTHS = 120;

/** The last twelve full months before today (UTC, so server and browser agree). */
function defaultMonths(now: Date) {
  const y = now.getUTCFullYear();
  const m = now.getUTCMonth();
  return {
    from: monthKey(new Date(Date.UTC(y, m - 12, 1))),
    to: monthKey(new Date(Date.UTC(y, m - 1, 1))),
  };
}

const linkButton =
  "inline-flex min-h-10 items-center justify-center rounded-lg bg-surface px-4 text-[15px] font-semibold text-ink ring-1 ring-inset ring-line-strong";

function ExportLinks({
  orgId,
  query,
}: {
  orgId: string;
  /** The export query string, or null while the filters cannot be asked for. */
  query: string | null;
}) {
  const links = [
    ["Export CSV", "csv"],
    ["Export XLSX", "xlsx"],
  ] as const;
  return (
    <>
      {links.map(([label, ext]) =>
        query === null ? (
          <a
            key={ext}
            aria-disabled="true"
            className={cx(linkButton, "cursor-not-allowed text-ink-faint")}
          >
            {label}
          </a>
        ) : (
          <a
            key={ext}
            href={`/api/v1/orgs/${orgId}/ledger.${ext}?${query}`}
            download
            className={cx(linkButton, "hover:bg-sunken")}
          >
            {label}
          </a>
        ),
      )}
    </>
  );
}

type Sites = Route.ComponentProps["loaderData"]["sites"];

function SiteOptions({ sites, all }: { sites: Sites; all: string }) {
  return (
    <>
      <option value="">{all}</option>
      {sites.map((s) => (
        <option key={s.id} value={s.id}>
          {s.name}
        </option>
      ))}
    </>
  );
}

function MonthClose({
  sites,
  canReopen,
  defaultMonth,
  result,
}: {
  sites: Sites;
  canReopen: boolean;
  defaultMonth: string;
  result: Result | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const closeForm = useRef<HTMLFormElement>(null);
  const reopenForm = useRef<HTMLFormElement>(null);
  // After a success the form starts again from its defaults.
  useEffect(() => {
    if (!result?.message) return;
    (result.intent === "reopen" ? reopenForm : closeForm).current?.reset();
  }, [result]);
  // The action treats anything but a reopen as a close.
  const errors: Record<string, string | undefined> = result?.errors ?? {};
  const close = result?.intent === "reopen" ? {} : errors;
  const reopen = result?.intent === "reopen" ? errors : {};
  return (
    <Card aria-labelledby="close-heading">
      <h2 id="close-heading" className="text-lg">
        Month close
      </h2>
      <p className="mt-1 text-ink-muted">
        A closed month is locked: corrections made later are kept as adjusting
        entries, with author, reason and time.
      </p>
      {result?.message ? (
        <div className="mt-3">
          <Notice tone="success">{result.message}</Notice>
        </div>
      ) : null}
      <div className="mt-4 grid gap-6 md:grid-cols-2">
        <Form
          method="post"
          ref={closeForm}
          noValidate
          aria-label="Close a month"
          className="flex flex-col gap-4"
        >
          <h3 className="font-semibold">Close a month</h3>
          {close.form ? <Notice tone="error">{close.form}</Notice> : null}
          <input type="hidden" name="intent" value="close" />
          <Field
            label="Month to close"
            name="month"
            type="month"
            required
            defaultValue={defaultMonth}
            error={close.month}
          />
          <SelectField
            label="Site to close"
            name="siteId"
            defaultValue=""
            error={close.siteId}
          >
            <SiteOptions sites={sites} all="Whole organisation" />
          </SelectField>
          <div>
            <Button type="submit" disabled={busy}>
              Close month
            </Button>
          </div>
        </Form>
        {canReopen ? (
          <Form
            method="post"
            ref={reopenForm}
            noValidate
            aria-label="Reopen a month"
            className="flex flex-col gap-4"
          >
            <h3 className="font-semibold">Reopen a month</h3>
            {reopen.form ? <Notice tone="error">{reopen.form}</Notice> : null}
            <input type="hidden" name="intent" value="reopen" />
            <Field
              label="Month to reopen"
              name="month"
              type="month"
              required
              defaultValue={defaultMonth}
              error={reopen.month}
            />
            <SelectField
              label="Site to reopen"
              name="siteId"
              defaultValue=""
              error={reopen.siteId}
            >
              <SiteOptions sites={sites} all="Whole organisation" />
            </SelectField>
            <Field
              label="Reason"
              name="reason"
              required
              maxLength={500}
              error={reopen.reason}
            />
            <div>
              <Button type="submit" variant="danger" disabled={busy}>
                Reopen
              </Button>
            </div>
          </Form>
        ) : null}
      </div>
    </Card>
  );
}

/**
 * The audit trail filtered to one row's adjusting entries: its site, month
 * and carrier, made since the month was closed (as the ledger counts them).
 */
function adjustmentsHref(orgId: string, row: LedgerRow): string {
  const query = new URLSearchParams({
    kind: "adjustment",
    site: row.site_id,
    month: row.month,
    carrier: row.carrier,
  });
  if (row.closed_at) query.set("since", row.closed_at);
  return `/o/${orgId}/audit?${query}`;
}

function Legend({ children }: { children: ReactNode }) {
  return <p className="mt-3 text-sm text-ink-muted">{children}</p>;
}

export default function LedgerPage({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { organization, sites, canClose, canReopen, canOpenAudit } = loaderData;
  const result = actionData as Result | undefined;
  const [filter, setFilter] = useUrlFilters();
  const defaults = useMemo(() => defaultMonths(new Date()), []);

  const from = filter("from") || defaults.from;
  const to = filter("to") || defaults.to;
  const rawSite = filter("site");
  const site = sites.some((s) => s.id === rawSite) ? rawSite : "";
  const rawCarrier = filter("carrier");
  const carrier = (carriers as readonly string[]).includes(rawCarrier)
    ? rawCarrier
    : "";
  const rawUnit = filter("unit");
  const unit = isLedgerUnit(rawUnit) ? rawUnit : "kWh";
  const perM2 = filter("per") === "m2";

  const fromError = MONTH.test(from) ? undefined : "Use a month like 2025-01.";
  const toError = !MONTH.test(to)
    ? "Use a month like 2025-12."
    : fromError
      ? undefined
      : to < from
        ? "The last month comes before the first."
        : monthCount(from, to) > MAX_MONTHS
          ? `Choose at most ${MAX_MONTHS} months at a time.`
          : undefined;
  const query =
    fromError || toError ? null : ledgerQuery({ from, to, site, carrier });

  const { ledger, error, loading, reload } = useLedger(organization.id, query);

  // After a month is closed or reopened, fetch the figures again.
  const handled = useRef<Result | undefined>(undefined);
  useEffect(() => {
    if (!result?.message || handled.current === result) return;
    handled.current = result;
    void reload();
  }, [result, reload]);

  // The grid measures the page, so it renders in the browser only.
  const mounted = useHydrated();

  // An adjusted row opens its adjusting entries in the audit trail.
  const adjustmentsLink = useMemo(
    () =>
      canOpenAudit
        ? (row: LedgerRow) => adjustmentsHref(organization.id, row)
        : undefined,
    [canOpenAudit, organization.id],
  );

  const siteName = sites.find((s) => s.id === site)?.name;
  const rows = ledger?.rows ?? [];

  return (
    <>
      <PageHeader
        title="Ledger"
        description="Monthly energy per site and carrier, rolled up from the intervals of the meters on each site's boundary."
        actions={
          <ExportLinks
            orgId={organization.id}
            query={query === null ? null : exportQuery(query, { unit, perM2 })}
          />
        }
      />
      <div className="flex flex-col gap-6">
        <p>
          Delivered energy is positive and exported energy negative, for each
          carrier; chilled water shows as cooling delivered. Carriers are never
          added together, so each has its own total. Each site&apos;s page shows
          its energy balance, where what enters the site counts positive and
          what leaves it negative.
        </p>
        <Card aria-labelledby="filters-heading">
          <h2 id="filters-heading" className="sr-only">
            Filters
          </h2>
          <div className="grid gap-4 sm:grid-cols-3 lg:grid-cols-6 lg:items-end">
            <Field
              label="From month"
              name="from"
              type="month"
              value={from}
              max={MONTH.test(to) ? to : undefined}
              onChange={(e) => setFilter("from", e.target.value)}
              error={fromError}
            />
            <Field
              label="To month"
              name="to"
              type="month"
              value={to}
              min={MONTH.test(from) ? from : undefined}
              onChange={(e) => setFilter("to", e.target.value)}
              error={toError}
            />
            <SelectField
              label="Site"
              name="site"
              value={site}
              onChange={(e) => setFilter("site", e.target.value)}
            >
              <SiteOptions sites={sites} all="All sites" />
            </SelectField>
            <SelectField
              label="Carrier"
              name="carrier"
              value={carrier}
              onChange={(e) => setFilter("carrier", e.target.value)}
            >
              <option value="">All carriers</option>
              {carriers.map((c) => (
                <option key={c} value={c}>
                  {carrierLabels[c]}
                </option>
              ))}
            </SelectField>
            <SelectField
              label="Unit"
              name="unit"
              value={unit}
              onChange={(e) =>
                setFilter(
                  "unit",
                  e.target.value === "kWh" ? "" : e.target.value,
                )
              }
            >
              {ledgerUnits.map((u) => (
                <option key={u} value={u}>
                  {u}
                </option>
              ))}
            </SelectField>
            <label className="flex min-h-10 items-center gap-2 font-semibold">
              <input
                type="checkbox"
                name="per"
                value="m2"
                checked={perM2}
                onChange={(e) => setFilter("per", e.target.checked ? "m2" : "")}
                className="h-5 w-5 accent-spruce-700"
              />
              per m² of floor area
            </label>
          </div>
          <p className="mt-3 text-sm text-ink-muted" role="status">
            {loading
              ? "Loading…"
              : ledger
                ? `${rows.length.toLocaleString("en-GB")} entries · ${siteName ?? "all sites"} · ${
                    carrier
                      ? carrierLabels[carrier as (typeof carriers)[number]]
                      : "all carriers"
                  }`
                : ""}
          </p>
          {error ? (
            <div className="mt-3">
              <Notice tone="error">{error}</Notice>
            </div>
          ) : null}
        </Card>
        {ledger && !loading && rows.length === 0 && !error ? (
          <EmptyState title="No ledger entries for these months">
            Entries appear once meters on a site's boundary have intervals in
            the months chosen.
          </EmptyState>
        ) : null}
        {mounted && ledger && rows.length > 0 ? (
          <Card aria-labelledby="ledger-heading">
            <h2 id="ledger-heading" className="text-lg">
              Monthly entries
            </h2>
            <div className="mt-3">
              <LedgerGrid
                ledger={ledger}
                unit={unit}
                perM2={perM2}
                adjustmentsLink={adjustmentsLink}
              />
            </div>
            <Legend>
              Estimated share: the part of the net figure that comes from
              estimated intervals. ± uncertainty: the heat meters' maximum
              permissible error (EN 1434), where it applies. Adjustments:
              corrections entered after the month was closed, with their count
              {canOpenAudit
                ? "; select one to see its entries in the audit trail"
                : ""}
              .
              {perM2
                ? " Per m²: each site's figures divided by its floor area; a carrier's total by the floor area of the sites listed with it."
                : ""}{" "}
              One total row per carrier (carriers are never added together);
              each adds its uncertainty bands, a bound that holds even when
              meter errors are correlated.
            </Legend>
          </Card>
        ) : null}
        {canClose ? (
          <MonthClose
            sites={sites}
            canReopen={canReopen}
            defaultMonth={defaults.to}
            result={result}
          />
        ) : null}
        <Cautions />
      </div>
    </>
  );
}
