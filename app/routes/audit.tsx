import { useMemo } from "react";
import {
  Link,
  useSearchParams,
  type ShouldRevalidateFunctionArgs,
} from "react-router";
import { auditFilterOptions } from "~/audit/audit-trail.server";
import { requirePermission } from "~/auth/page-access.server";
import {
  AuditFilterFields,
  periodErrors,
  useAuditFilters,
} from "~/components/audit/audit-filters";
import { AuditGrid } from "~/components/audit/audit-grid";
import { LedgerScope } from "~/components/audit/ledger-scope";
import { auditQuery, useAuditEntries } from "~/components/audit/use-audit";
import { ExportLink } from "~/components/export-link";
import { FiltersCard } from "~/components/filters";
import { SectionCard } from "~/components/section-card";
import { Button, EmptyState, PageHeader } from "~/components/ui";
import { formatCount } from "~/lib/format";
import { useHydrated } from "~/lib/use-hydrated";
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

export default function AuditTrailPage({ loaderData }: Route.ComponentProps) {
  const { organization } = loaderData;
  const { values, meters, set } = useAuditFilters(loaderData);
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
          <ExportLink
            href={
              query === null
                ? null
                : `/api/v1/orgs/${organization.id}/audit.csv?${query}`
            }
          >
            Export CSV
          </ExportLink>
        }
      />
      <div className="flex flex-col gap-6">
        <LedgerScope
          values={values}
          siteName={siteName}
          onClear={clearLedgerScope}
        />
        <FiltersCard
          error={error}
          status={
            loading
              ? "Loading…"
              : query !== null && !error
                ? `${formatCount(entries.length)} ${entries.length === 1 ? "entry" : "entries"}${hasOlder ? " so far" : ""}, newest first`
                : ""
          }
        >
          <AuditFilterFields
            options={loaderData}
            meters={meters}
            values={values}
            set={set}
          />
        </FiltersCard>
        {!loading && !error && query !== null && entries.length === 0 ? (
          <EmptyState title="No changes match these filters">
            Changes appear here as people correct hours, close months, look
            after meters, gateways and members, and as billing changes.
          </EmptyState>
        ) : null}
        {mounted && entries.length > 0 ? (
          <SectionCard headingId="entries-heading" title="Changes">
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
          </SectionCard>
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
