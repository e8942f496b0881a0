/**
 * The ledger's rows for a period, arranged for a report: per site and
 * carrier a table of months with its total, totals per carrier, and each
 * month's closed or provisional status. Pure: the rows come from
 * ledgerRows(), the closes from month_closes.
 */
import type { LedgerRow } from "~/ledger/ledger-rows.server";
import { carrierReportOrder } from "~/sites/meter-kinds";
import { absDecimal, sumDecimals } from "./decimal";
import type {
  Carrier,
  CarrierTable,
  EntryTotal,
  LedgerEntry,
  MonthStatus,
} from "./types";

const byCarrier = (a: Carrier, b: Carrier) =>
  carrierReportOrder.indexOf(a) - carrierReportOrder.indexOf(b);

export function toEntry(row: LedgerRow): LedgerEntry {
  return {
    month: row.month,
    carrier: row.carrier as Carrier,
    importsKwh: row.imports_kwh,
    exportsKwh: row.exports_kwh,
    netKwh: row.net_kwh,
    estimatedKwh: row.estimated_kwh,
    estimatedShare: row.estimated_share,
    uncertaintyKwh: row.uncertainty_kwh,
    status: row.status,
    adjustmentsKwh: row.adjustments_kwh,
    adjustmentCount: row.adjustment_count,
    cost: row.cost,
    currency: row.currency,
  };
}

/** The entries' cost, exactly summed, when they are priced in one currency. */
function costOf(entries: readonly LedgerEntry[]) {
  const priced = entries.filter((e) => e.cost !== null && e.currency !== null);
  const currencies = new Set(priced.map((e) => e.currency));
  if (priced.length === 0 || currencies.size !== 1)
    return { cost: null, currency: null };
  return {
    cost: sumDecimals(priced.map((e) => e.cost!)),
    currency: priced[0].currency,
  };
}

/**
 * Totals of entries, exactly for the energy; the estimated share is, as on
 * the Ledger page, estimated energy over the energy metered in and out; the
 * uncertainty bands are added (a bound that holds even when the meters'
 * errors are correlated).
 */
export function totalOf(entries: readonly LedgerEntry[]): EntryTotal {
  const metered = entries.reduce(
    (s, e) =>
      s + Math.abs(Number(e.importsKwh)) + Math.abs(Number(e.exportsKwh)),
    0,
  );
  const estimated = entries.reduce(
    (s, e) => s + Math.abs(Number(e.estimatedKwh)),
    0,
  );
  const bands = entries
    .map((e) => e.uncertaintyKwh)
    .filter((u): u is string => u !== null);
  return {
    importsKwh: sumDecimals(entries.map((e) => e.importsKwh)),
    exportsKwh: sumDecimals(entries.map((e) => e.exportsKwh)),
    netKwh: sumDecimals(entries.map((e) => e.netKwh)),
    estimatedShare: metered > 0 ? estimated / metered : 0,
    uncertaintyKwh: bands.length ? sumDecimals(bands.map(absDecimal)) : null,
    adjustmentsKwh: sumDecimals(entries.map((e) => e.adjustmentsKwh)),
    adjustmentCount: entries.reduce((s, e) => s + e.adjustmentCount, 0),
    ...costOf(entries),
  };
}

/** One table per carrier, months in order. */
export function carrierTables(entries: readonly LedgerEntry[]): CarrierTable[] {
  const carriers = [...new Set(entries.map((e) => e.carrier))].sort(byCarrier);
  return carriers.map((carrier) => {
    const rows = entries
      .filter((e) => e.carrier === carrier)
      .sort((a, b) => a.month.localeCompare(b.month));
    return { carrier, entries: rows, total: totalOf(rows) };
  });
}

/** Totals per carrier over every site, in carrier order. */
export function carrierTotals(
  entries: readonly LedgerEntry[],
): (EntryTotal & { carrier: Carrier })[] {
  return carrierTables(entries).map((t) => ({
    carrier: t.carrier,
    ...t.total,
  }));
}

export interface ActiveClose {
  siteId: string | null;
  /** YYYY-MM */
  month: string;
}

/**
 * A month is closed for the report when the organisation closed it, when
 * the one site reported on closed it, or when every site with ledger
 * entries that month shows it closed. A month without entries and without
 * a close is open: nothing says its figures are final.
 */
export function monthStatuses(args: {
  months: readonly string[];
  rows: readonly LedgerRow[];
  closes: readonly ActiveClose[];
  siteId: string | null;
}): MonthStatus[] {
  return args.months.map((month) => {
    const organisation = args.closes.some(
      (c) => c.siteId === null && c.month === month,
    );
    const sites = new Map<string, boolean>();
    for (const row of args.rows) {
      if (row.month !== month) continue;
      sites.set(
        row.site_id,
        (sites.get(row.site_id) ?? true) && row.status === "closed",
      );
    }
    const sitesClosed = [...sites.values()].filter(Boolean).length;
    const siteClosed =
      args.siteId !== null &&
      args.closes.some((c) => c.siteId === args.siteId && c.month === month);
    const closed =
      organisation ||
      siteClosed ||
      (sites.size > 0 && sitesClosed === sites.size);
    return {
      month,
      closed,
      closedForOrganisation: organisation,
      sitesWithEntries: sites.size,
      sitesClosed,
    };
  });
}
