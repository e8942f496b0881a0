/**
 * Everything a report shows, as plain data: the loaders fill it from the
 * database (report-data.server.ts), the PDF modules only draw it. Energy
 * figures that the ledger shows stay decimal strings (kWh, PostgreSQL
 * numeric) so the report prints exactly the ledger's digits; derived model
 * figures are numbers. Ledger figures are delivered (≥ 0) and exported (≤ 0)
 * energy of one carrier (~/ledger/delivered.ts) and are never added across
 * carriers; only the site's energy balance carries the signed thermodynamic
 * view (into the site positive), and says so.
 */
import type { PlantFault } from "~/plant/plant-fault";
import type { ResidualFlag } from "~/ledger/balance";
import type { Carrier, Orientation } from "~/sites/meter-kinds";
import type { ReportPeriod } from "../periods";

export type { Carrier };
export type DegreeDayDriver = "hdd" | "cdd";

/** Whether a month of the period is closed, for the report's scope. */
export interface MonthStatus {
  /** YYYY-MM, a site-local month. */
  month: string;
  closed: boolean;
  /** Closed for the whole organisation (not site by site). */
  closedForOrganisation: boolean;
  /** Sites with ledger entries this month, and how many of them are closed. */
  sitesWithEntries: number;
  sitesClosed: number;
}

/** One site × carrier × month entry, as the ledger shows it. */
export interface LedgerEntry {
  month: string;
  carrier: Carrier;
  /** Delivered, ≥ 0 (cooling delivered for chilled water). */
  importsKwh: string;
  /** Exported, ≤ 0. */
  exportsKwh: string;
  netKwh: string;
  estimatedKwh: string;
  /** Estimated energy over the energy metered, 0…1. */
  estimatedShare: number;
  /** EN 1434 band (± kWh) for heat and cooling where the meters are rated. */
  uncertaintyKwh: string | null;
  status: "open" | "closed";
  /** Changes since the month was closed, not in the figures above. */
  adjustmentsKwh: string;
  adjustmentCount: number;
  /** What the entry's supplies cost under their tariffs (exact decimal), and its currency; null: no tariff. */
  cost: string | null;
  currency: string | null;
}

export interface EntryTotal {
  importsKwh: string;
  exportsKwh: string;
  netKwh: string;
  estimatedShare: number;
  uncertaintyKwh: string | null;
  adjustmentsKwh: string;
  adjustmentCount: number;
  /** The exact sum of the entries' cost; null when none is priced or their currencies differ. */
  cost: string | null;
  currency: string | null;
}

export interface CarrierTable {
  carrier: Carrier;
  entries: LedgerEntry[];
  total: EntryTotal;
}

export interface BaselineMonth {
  month: string;
  hdd: number | null;
  cdd: number | null;
  /** The driver's degree days, when the month's weather is complete. */
  dd: number | null;
  weatherDays: number;
  daysInMonth: number;
  /** What the boundary import meters measured, a magnitude (kWh). */
  actualKwh: number | null;
  /** The model at the month's degree days (kWh). */
  expectedKwh: number | null;
  /** (actual − expected) ÷ expected: positive when more was used. */
  difference: number | null;
  /** Degree days outside the range the baseline was fitted on. */
  extrapolated: boolean;
  note: string | null;
}

export interface Assessment {
  value: number | null;
  limit: number;
  pass: boolean;
}

export interface BaselineComparison {
  carrier: Carrier;
  baselineId: string;
  /** The baseline period, YYYY-MM, inclusive. */
  from: string;
  to: string;
  granularity: "monthly" | "daily";
  driver: DegreeDayDriver;
  /** The base the model was fitted with, °C. */
  baseC: number;
  /** The site's degree-day base now, °C (may differ from the model's). */
  siteBaseC: number;
  intercept: number;
  slope: number;
  n: number;
  p: number;
  r2: number | null;
  cvrmse: number | null;
  nmbe: number | null;
  assessment: { cvrmse: Assessment; nmbe: Assessment };
  /** Fitted on under a year of months: the caution to print, else null. */
  shortFitWarning: string | null;
  createdAt: string;
  createdBy: string | null;
  months: BaselineMonth[];
  /** Over the months with both figures (IPMVP avoided energy use). */
  comparedMonths: number;
  expectedKwh: number;
  actualKwh: number;
  avoidedKwh: number;
  avoidedPercent: number | null;
}

/** A parent meter against its sub-meters over the period. */
export interface Residual {
  code: string;
  name: string;
  carrier: Carrier;
  parentKwh: string;
  childrenKwh: string;
  residualKwh: string;
  residualFraction: number | null;
  childCount: number;
  flag: ResidualFlag;
}

/** A carrier's boundary figures for the period: the ledger's, delivered view. */
export interface CarrierBalance {
  carrier: Carrier;
  importsKwh: string;
  exportsKwh: string;
  netKwh: string;
}

export interface SiteEnergyBalance {
  carriers: CarrierBalance[];
  /**
   * The thermodynamic view: heat and work into the site, signed (+ in), over
   * every carrier, Q + W. Cooling delivered counts as heat out (Q < 0).
   */
  netIntoSiteKwh: string;
  residuals: Residual[];
}

export interface SiteReport {
  id: string;
  name: string;
  timeZone: string;
  degreeDayBaseC: number;
  floorAreaM2: number | null;
  archived: boolean;
  tables: CarrierTable[];
  baselines: BaselineComparison[];
  balance: SiteEnergyBalance;
}

export interface AdjustmentEntry {
  id: number;
  /** ISO 8601 instant the entry was recorded. */
  recordedAt: string;
  month: string;
  siteName: string;
  meterCode: string;
  meterName: string;
  carrier: Carrier;
  subMeter: boolean;
  deltaKwh: string;
  /** late_data, edit or estimate */
  source: string;
  reason: string;
  /** A person's name, a gateway ("Gateway …") or "Automatic" (the app). */
  author: string;
}

export interface MeterQuality {
  siteName: string;
  code: string;
  name: string;
  carrier: Carrier;
  orientation: Orientation;
  subMeter: boolean;
  retired: boolean;
  /** Hours the meter was installed within the period (up to generation). */
  expectedHours: number;
  measuredHours: number;
  estimatedHours: number;
  editedHours: number;
  /** Expected hours without a measured, estimated or edited value. */
  missingHours: number;
  /** Longest run of hours without a measured value, in the period. */
  longestSilentHours: number;
  conflicts: number;
  openConflicts: number;
}

export interface DataQuality {
  meters: MeterQuality[];
  expectedHours: number;
  measuredHours: number;
  estimatedHours: number;
  editedHours: number;
  missingHours: number;
  /** A spell this long without a measured hour makes a meter silent. */
  silentAfterHours: number;
  silentMeters: number;
  conflicts: number;
  openConflicts: number;
}

export interface UnitFactor {
  unit: string;
  kwh: number;
  source: string;
}

export interface MethodFacts {
  unitFactors: UnitFactor[];
  degreeDayBases: { siteName: string; baseC: number }[];
  guideline14: {
    monthly: { cvrmse: number; nmbe: number };
    daily: { cvrmse: number; nmbe: number };
  };
  residualTolerance: number;
  gaugeOffsetBar: number;
}

export interface ReportData {
  reportId: string;
  organization: { id: string; name: string };
  /** siteId null: the whole organisation ("All sites"). */
  scope: { siteId: string | null; label: string };
  period: ReportPeriod;
  /** ISO 8601 instant. */
  generatedAt: string;
  /** IANA zone the generation time is shown in. */
  timeZone: string;
  authorName: string;
  months: MonthStatus[];
  closedMonths: number;
  allMonthsClosed: boolean;
  /** Per carrier, the ledger's own totals for the period and scope. */
  carrierTotals: (EntryTotal & { carrier: Carrier })[];
  sites: SiteReport[];
  adjustments: AdjustmentEntry[];
  dataQuality: DataQuality;
  /** Plant in scope, checked month by month against the laws (app/plant/). */
  plantChecks: { plants: number; faults: PlantFault[] };
  method: MethodFacts;
  cautions: string[];
  /** Carbon of the delivered energy, from the ledger's own sums, and the factors' sources. */
  carbon: ReportCarbon;
  /** The budgets and carbon target of the financial year the period ends in (app/budgets). */
  budgets: ReportBudgets;
}

export interface ReportBudgets {
  /** The financial year's label, e.g. "FY 2025/26". */
  label: string;
  /** The last month counted as actual; later months are forecast. */
  lastMonthToDate: string;
  rows: {
    siteName: string;
    carrier: Carrier;
    budgetKwh: string;
    actualKwhToDate: string;
    forecastKwh: string;
    /** Null: no money budget, or no tariff prices the supply. */
    money: {
      currency: string;
      budget: string;
      actualToDate: string;
      forecast: string;
    } | null;
  }[];
  /** Null: no carbon target, or a site's report (the target is the estate's). */
  carbon: {
    reductionPercent: string;
    baseYear: number;
    basis: "location" | "market";
    allowedKg: string;
    actualKgToDate: string;
    forecastKg: string;
  } | null;
}

export interface ReportCarbon {
  byCarrier: {
    carrier: Carrier;
    co2eKg: string | null;
    co2eMarketKg: string | null;
  }[];
  /** Across carriers: carbon may be added, kWh never. */
  totalKg: string;
  totalMarketKg: string;
  rowsWithoutFactor: number;
  sources: {
    year: number;
    carrier: Carrier;
    scope: 1 | 2;
    source: string;
    version: string;
  }[];
}
