/**
 * Everything a report shows, loaded in a fixed handful of queries whatever
 * the number of sites, meters or months (no query per row): the ledger for
 * the period (the same function the Ledger page uses, so the figures are
 * the same), the month closes, the meters' period sums for the sub-meter
 * residuals, the saved baselines and weather, the adjusting entries and the
 * hour counts behind the data-quality summary. The PDF modules draw it.
 */
import {
  ledgerRows,
  type CarrierTotal,
  type LedgerRow,
} from "~/ledger/ledger-rows.server";
import type pg from "pg";
import { withCaughtUpSource } from "~/db/read-source.server";
import type { ReportPeriod } from "./periods";
import { periodAdjustments } from "./data/adjustments.server";
import { compareWithBaseline } from "./data/baseline-comparison";
import { baselinesInForce, periodTemperatures } from "./data/baselines.server";
import { CAUTIONS } from "~/lib/cautions";
import { dataQuality } from "./data/data-quality";
import { meterHourCounts } from "./data/data-quality.server";
import {
  carrierTables,
  carrierTotals,
  monthStatuses,
  toEntry,
} from "./data/ledger-tables";
import { meterPeriodEnergy } from "./data/meter-energy.server";
import { methodFacts } from "./data/method-facts";
import { plantChecks } from "~/plant/plant-faults.server";
import { siteBalanceOf, type MeterPeriodEnergy } from "./data/period-balance";
import {
  activeCloses,
  organizationName,
  scopeSites,
  type ScopeSite,
} from "./data/scope.server";
import type { DailyTemperature } from "~/baselines/degree-days";
import type { SavedBaselineRow } from "./data/baseline-comparison";
import type { ReportData, SiteReport } from "./data/types";

import { factorSources } from "~/carbon/emission-factors.server";
import { reportBudgets } from "./data/budgets.server";

export type * from "./data/types";

export interface ReportDataInput {
  organizationId: string;
  /** null: every site of the organisation. */
  siteId: string | null;
  period: ReportPeriod;
  reportId: string;
  authorName: string;
  generatedAt: Date;
}

const monthKeys = (period: ReportPeriod) =>
  period.months.map((m) => m.slice(0, 7));

function siteReport(args: {
  site: ScopeSite;
  rows: readonly LedgerRow[];
  meters: readonly MeterPeriodEnergy[];
  baselines: readonly SavedBaselineRow[];
  temperatures: readonly DailyTemperature[];
  months: readonly string[];
}): SiteReport {
  const { site } = args;
  const entries = args.rows.map(toEntry);
  const tables = carrierTables(entries);
  const baselines = args.baselines.map((baseline) => {
    const actual = new Map(
      entries
        .filter((e) => e.carrier === baseline.carrier)
        .map((e) => [e.month, Number(e.importsKwh)]),
    );
    return compareWithBaseline({
      baseline,
      siteBaseC: site.degreeDayBaseC,
      months: args.months,
      temperatures: args.temperatures,
      actualKwh: actual,
    });
  });
  return {
    ...site,
    tables,
    baselines,
    balance: siteBalanceOf(tables, args.meters),
  };
}

/** Each carrier's energy totals as the ledger itself gives them: the same digits. */
function withLedgerTotals(
  totals: ReportData["carrierTotals"],
  ledger: readonly CarrierTotal[],
): ReportData["carrierTotals"] {
  return totals.map((t) => {
    const own = ledger.find((l) => l.carrier === t.carrier);
    return own
      ? {
          ...t,
          importsKwh: own.imports_kwh,
          exportsKwh: own.exports_kwh,
          netKwh: own.net_kwh,
          cost: own.cost,
          currency: own.currency,
        }
      : t;
  });
}

/** The zone of the site(s) reported on; UTC when the sites differ. */
function displayZone(sites: readonly ScopeSite[]): string {
  const zones = new Set(sites.map((s) => s.timeZone));
  return zones.size === 1 ? [...zones][0] : "UTC";
}

/**
 * Read from the standby once it has replayed everything committed when the
 * report is drawn (a correction made just before the request included),
 * else from the primary (app/db/read-source.server.ts).
 */
export function loadReportData(input: ReportDataInput): Promise<ReportData> {
  return withCaughtUpSource((source) => loadReportDataFrom(input, source.pool));
}

async function loadReportDataFrom(
  input: ReportDataInput,
  readPool: pg.Pool,
): Promise<ReportData> {
  const { organizationId, siteId, period } = input;
  const months = monthKeys(period);
  const scoped = scopeSites(organizationId, siteId, readPool);
  // Baselines and weather of every site in scope, archived ones too, so they
  // need not wait for the ledger that says which archived sites are listed.
  const siteWeather = scoped.then(async (all) => {
    const ids = all.map((s) => s.id);
    return Promise.all([
      baselinesInForce(organizationId, ids, readPool),
      periodTemperatures(organizationId, ids, period, readPool),
    ] as const);
  });
  const [
    name,
    sites,
    closes,
    ledger,
    meters,
    adjustments,
    counts,
    plants,
    budgets,
    [baselines, temperatures],
    sources,
  ] = await Promise.all([
    organizationName(organizationId, readPool),
    scoped,
    activeCloses(organizationId, period, readPool),
    ledgerRows(
      {
        organizationId,
        from: months[0],
        to: months[months.length - 1],
        siteId,
      },
      readPool,
    ),
    meterPeriodEnergy(organizationId, siteId, period, readPool),
    periodAdjustments(organizationId, siteId, period, readPool),
    meterHourCounts(
      {
        organizationId,
        siteId,
        period,
        generatedAt: input.generatedAt,
      },
      readPool,
    ),
    plantChecks({ organizationId, siteId, months }),
    reportBudgets({
      organizationId,
      siteId,
      lastMonth: months[months.length - 1],
      generatedAt: input.generatedAt,
    }),
    siteWeather,
    factorSources(organizationId, [
      ...new Set(months.map((m) => Number(m.slice(0, 4)))),
    ]),
  ]);
  // Archived sites appear only when the period has ledger entries for them.
  const listed = sites.filter(
    (s) => !s.archived || ledger.rows.some((r) => r.site_id === s.id),
  );
  const statuses = monthStatuses({
    months,
    rows: ledger.rows,
    closes,
    siteId,
  });
  const closedMonths = statuses.filter((m) => m.closed).length;
  return {
    reportId: input.reportId,
    organization: { id: organizationId, name },
    scope: { siteId, label: siteId ? listed[0].name : "All sites" },
    period,
    generatedAt: input.generatedAt.toISOString(),
    timeZone: displayZone(listed),
    authorName: input.authorName,
    months: statuses,
    closedMonths,
    allMonthsClosed: closedMonths === statuses.length,
    carrierTotals: withLedgerTotals(
      carrierTotals(ledger.rows.map(toEntry)),
      ledger.totals,
    ),
    sites: listed.map((site) =>
      siteReport({
        site,
        rows: ledger.rows.filter((r) => r.site_id === site.id),
        meters: meters.filter((m) => m.siteId === site.id),
        baselines: baselines.get(site.id) ?? [],
        temperatures: temperatures.get(site.id) ?? [],
        months,
      }),
    ),
    adjustments,
    dataQuality: dataQuality(counts),
    plantChecks: plants,
    method: methodFacts(listed),
    cautions: [...CAUTIONS],
    carbon: {
      byCarrier: ledger.totals.map((t) => ({
        carrier: t.carrier,
        co2eKg: t.co2e_kg,
        co2eMarketKg: t.co2e_market_kg,
      })),
      totalKg: ledger.carbon_total.co2e_kg,
      totalMarketKg: ledger.carbon_total.co2e_market_kg,
      rowsWithoutFactor: ledger.carbon_total.rows_without_factor,
      sources,
    },
    budgets,
  };
}
