import { useEffect, useMemo, useRef } from "react";
import { data, type ShouldRevalidateFunctionArgs } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { CarbonTotal } from "~/components/carbon/carbon-total";
import { Cautions } from "~/components/cautions";
import { ExportLink } from "~/components/export-link";
import { FiltersCard } from "~/components/filters";
import {
  adjustmentsHref,
  LedgerEntries,
} from "~/components/ledger/ledger-entries";
import {
  LedgerFilterFields,
  useLedgerFilters,
} from "~/components/ledger/ledger-filters";
import { MonthClose } from "~/components/ledger/month-close";
import {
  exportQuery,
  ledgerQuery,
  useLedger,
  type LedgerRow,
} from "~/components/ledger/use-ledger";
import { EmptyState, PageHeader } from "~/components/ui";
import {
  closeSchema,
  monthCloseMessage,
  reopenSchema,
  type MonthCloseResult as Result,
} from "~/ledger/month-close-form";
import { closeMonth, reopenMonth } from "~/ledger/month-close.server";
import { formatCount } from "~/lib/format";
import { useHydrated } from "~/lib/use-hydrated";
import { parseForm } from "~/lib/forms";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { carrierLabels } from "~/sites/meter-kinds";
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
    financialYearStart: await financialYearStart(organization.id),
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
    message: monthCloseMessage(reopening, month, where),
  });
}

export default function LedgerPage({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { organization, sites, canClose, canReopen, canOpenAudit } = loaderData;
  const result = actionData as Result | undefined;
  const filters = useLedgerFilters(sites);
  const { from, to, site, carrier, unit, perM2 } = filters.values;
  const { fromError, toError } = filters.errors;
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
  const exportHref = (ext: "csv" | "xlsx") =>
    query === null
      ? null
      : `/api/v1/orgs/${organization.id}/ledger.${ext}?${exportQuery(query, { unit, perM2 })}`;

  return (
    <>
      <PageHeader
        title="Ledger"
        description="Monthly energy per site and carrier, rolled up from the intervals of the meters on each site's boundary."
        actions={
          <>
            <ExportLink href={exportHref("csv")}>Export CSV</ExportLink>
            <ExportLink href={exportHref("xlsx")}>Export XLSX</ExportLink>
          </>
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
        <FiltersCard
          error={error}
          status={
            loading
              ? "Loading…"
              : ledger
                ? `${formatCount(rows.length)} entries · ${siteName ?? "all sites"} · ${
                    carrier ? carrierLabels[carrier] : "all carriers"
                  }`
                : ""
          }
        >
          <LedgerFilterFields
            filters={filters}
            sites={sites}
            financialYearStart={loaderData.financialYearStart}
          />
        </FiltersCard>
        {ledger && !loading && rows.length === 0 && !error ? (
          <EmptyState title="No ledger entries for these months">
            Entries appear once meters on a site's boundary have intervals in
            the months chosen.
          </EmptyState>
        ) : null}
        {mounted && ledger && rows.length > 0 ? (
          <CarbonTotal ledger={ledger} />
        ) : null}
        {mounted && ledger && rows.length > 0 ? (
          <LedgerEntries
            ledger={ledger}
            unit={unit}
            perM2={perM2}
            adjustmentsLink={adjustmentsLink}
          />
        ) : null}
        {canClose ? (
          <MonthClose
            sites={sites}
            canReopen={canReopen}
            defaultMonth={filters.defaults.to}
            result={result}
          />
        ) : null}
        <Cautions />
      </div>
    </>
  );
}
