/**
 * An audit entry's before and after values as lines a person reads: the
 * field in words and each value formatted (roles by name, kWh with their
 * unit, dates in UTC, meters by code). The page and the CSV export use the
 * same lines, so both say the same thing.
 */
import { roleLabels, isRole } from "~/auth/permissions";
import { driverLabels } from "~/baselines/degree-days";
import {
  calendarDay,
  dateTimeUtc,
  dayUtc,
  formatNumber,
  monthLong,
} from "~/lib/format";
import {
  carrierLabels,
  carriers,
  quantities,
  quantityLabels,
} from "~/sites/meter-kinds";

export interface ChangeLine {
  field: string;
  before: string;
  after: string;
}

/** Names the stored values refer to by id. */
export interface NameLookup {
  meterCodes: ReadonlyMap<string, string>;
}

type Format = (value: unknown, names: NameLookup) => string;

const NONE = "—";

/** The trail shows an hour's energy as stored, to the micro-kWh. */
const STORED_KWH_DECIMALS = 6;

function energy(value: unknown): string {
  const n = Number(value);
  if (value === null || value === "" || !Number.isFinite(n)) return NONE;
  return `${formatNumber(n, STORED_KWH_DECIMALS)} kWh`;
}

function signedEnergy(value: unknown): string {
  const text = energy(value);
  return Number(value) > 0 ? `+${text}` : text;
}

/** A stored instant; midnight UTC is a date someone chose, shown without a time. */
function instant(value: unknown): string {
  if (typeof value !== "string" || value === "") return NONE;
  const date = new Date(value);
  if (Number.isNaN(date.getTime())) return value;
  return date.toISOString().endsWith("T00:00:00.000Z")
    ? dayUtc(date)
    : dateTimeUtc(date);
}

/** A calendar month (YYYY-MM) or day (YYYY-MM-DD), as written on a calendar. */
function calendar(value: unknown): string {
  if (typeof value !== "string") return NONE;
  const match = /^(\d{4})-(\d{2})(?:-(\d{2}))?$/.exec(value);
  if (!match) return plain(value);
  return match[3] ? calendarDay(value) : monthLong(value);
}

function fromTable(table: Record<string, string>): Format {
  return (value) =>
    typeof value === "string" && Object.hasOwn(table, value)
      ? table[value]
      : plain(value);
}

function plain(value: unknown): string {
  if (value === null || value === undefined || value === "") return NONE;
  if (typeof value === "boolean") return value ? "Yes" : "No";
  if (typeof value === "object") return JSON.stringify(value);
  return String(value);
}

/** Exact decimals as stored ("2.5000") without their padding zeros. */
function decimal(value: unknown): string {
  if (typeof value === "string" && /^-?\d+\.\d+$/.test(value))
    return value.replace(/\.?0+$/, "");
  return plain(value);
}

/** A fitted coefficient: three decimals say all a reader can use. */
function rounded(value: unknown): string {
  return typeof value === "number" && Number.isFinite(value)
    ? formatNumber(value, 3)
    : plain(value);
}

const meterCode: Format = (value, names) =>
  typeof value === "string" && value !== ""
    ? (names.meterCodes.get(value) ?? "another meter")
    : NONE;

const role: Format = (value) =>
  isRole(value) ? roleLabels[value] : plain(value);

const quantityNames = Object.fromEntries(
  quantities.map((q) => [q, quantityLabels[q]]),
);
const carrierNames = Object.fromEntries(
  carriers.map((c) => [c, carrierLabels[c]]),
);

/** The fields stored in before/after, in words. Unknown fields show as written. */
const FIELDS: Record<string, { label: string; format?: Format }> = {
  energyKwh: { label: "Energy", format: energy },
  deltaKwh: { label: "Change", format: signedEnergy },
  quality: {
    label: "Quality",
    format: fromTable({
      measured: "Measured",
      estimated: "Estimated",
      edited: "Corrected by hand",
      missing: "Missing",
    }),
  },
  month: { label: "Month", format: calendar },
  // A gas supply's calorific values and its meter's gas settings (app/gas).
  calorificValueMjM3: { label: "Calorific value (MJ/m³)" },
  basis: { label: "Basis", format: fromTable({ gross: "Gross", net: "Net" }) },
  registerUnit: {
    label: "Gas register",
    format: fromTable({ m3: "Cubic metres", hcf: "Hundreds of cubic feet" }),
  },
  correctionFactor: { label: "Volume correction factor" },
  gasTempC: { label: "Gas temperature (°C)" },
  gasPressureMbarG: { label: "Gas pressure (mbar g)" },
  atmosphericPressureMbar: { label: "Atmospheric pressure (mbar)" },
  role: { label: "Role", format: role },
  email: { label: "E-mail" },
  name: { label: "Name" },
  code: { label: "Code" },
  serial: { label: "Serial number" },
  quantity: { label: "Measures", format: fromTable(quantityNames) },
  carrier: { label: "Carrier", format: fromTable(carrierNames) },
  orientation: {
    label: "Direction",
    format: fromTable({ import: "Import (+)", export: "Export (−)" }),
  },
  parentMeterId: { label: "Parent meter", format: meterCode },
  position: {
    label: "Position",
    format: fromTable({
      boundary: "On the boundary",
      internal: "Inside the boundary",
    }),
  },
  multiplier: { label: "Multiplier", format: decimal },
  rolloverKwh: { label: "Roll-over point", format: energy },
  sensorAt: {
    label: "Flow sensor in",
    format: fromTable({ flow: "Flow pipe", return: "Return pipe" }),
  },
  defaultPressureBarAbs: {
    label: "Default pressure (bar abs)",
    format: decimal,
  },
  spikeFactor: { label: "Spike factor", format: decimal },
  accuracyClass: { label: "EN 1434 class" },
  deltaThetaMinK: { label: "Δθmin (K)", format: decimal },
  qpM3PerH: { label: "qp (m³/h)", format: decimal },
  installedAt: { label: "Installed on", format: instant },
  removedAt: { label: "Removed on", format: instant },
  swappedAt: { label: "Swapped on", format: instant },
  replacementMeterId: { label: "Replaced by", format: meterCode },
  // Tanks (app/tanks): litres and fuel figures as entered.
  capacityL: { label: "Capacity (l)", format: decimal },
  stockL: { label: "Stock (l)", format: decimal },
  volumeL: { label: "Delivered (l)", format: decimal },
  densityKgL: { label: "Density (kg/l)", format: decimal },
  calorificValueMjKg: { label: "CV (MJ/kg)", format: decimal },
  cvBasis: { label: "CV basis" },
  dippedAt: { label: "Dipped at", format: instant },
  deliveredAt: { label: "Delivered at", format: instant },
  timeZone: { label: "Time zone" },
  floorAreaM2: { label: "Floor area (m²)", format: decimal },
  degreeDayBaseC: { label: "Degree-day base (°C)", format: decimal },
  address: { label: "Address" },
  keyPrefix: { label: "Key starts with" },
  expiresAt: { label: "Expires", format: instant },
  status: {
    label: "Subscription status",
    format: fromTable({
      none: "None",
      trialing: "Trial",
      active: "Active",
      past_due: "Past due",
      unpaid: "Unpaid",
      canceled: "Cancelled",
      incomplete: "Awaiting first payment",
      incomplete_expired: "First payment never made",
      paused: "Paused",
    }),
  },
  invoiceStatus: {
    label: "Invoice",
    format: fromTable({
      draft: "Draft",
      open: "Open (unpaid)",
      paid: "Paid",
      uncollectible: "Uncollectible",
      void: "Void",
    }),
  },
  subscription: { label: "Stripe subscription" },
  billedSites: { label: "Billed sites" },
  cancelAtPeriodEnd: { label: "Cancels at period end" },
  currentPeriodEnd: { label: "Current period ends", format: instant },
  pastDueSince: { label: "Past due since", format: instant },
  trialEndsAt: { label: "Trial ends", format: instant },
  from: { label: "From", format: calendar },
  to: { label: "To", format: calendar },
  driver: {
    label: "Driver",
    format: fromTable(driverLabels),
  },
  slope: { label: "Slope (kWh per degree day)", format: rounded },
  intercept: { label: "Base load (kWh per month)", format: rounded },
  n: { label: "Months fitted" },
  days: { label: "Days" },
  inserted: { label: "Days added" },
  updated: { label: "Days replaced" },
  title: { label: "Title" },
  period: { label: "Period" },
  state: {
    label: "State",
    format: fromTable({
      open: "Open",
      closed: "Closed",
      active: "Active",
      revoked: "Revoked",
      withdrawn: "Withdrawn",
    }),
  },
};

/** "rolloverKwh" → "Rollover kwh": the fallback for fields not listed. */
function words(key: string): string {
  const spaced = key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

function line(
  key: string,
  before: Record<string, unknown> | null,
  after: Record<string, unknown> | null,
  names: NameLookup,
): ChangeLine {
  const field = FIELDS[key];
  const format = field?.format ?? plain;
  const show = (values: Record<string, unknown> | null) =>
    values && Object.hasOwn(values, key) ? format(values[key], names) : NONE;
  return {
    field: field?.label ?? words(key),
    before: show(before),
    after: show(after),
  };
}

/** Known fields in the order above, then any others alphabetically. */
const FIELD_ORDER = Object.keys(FIELDS);
function byFieldOrder(a: string, b: string): number {
  const rank = (key: string) => {
    const i = FIELD_ORDER.indexOf(key);
    return i === -1 ? FIELD_ORDER.length : i;
  };
  return rank(a) - rank(b) || a.localeCompare(b);
}

/**
 * One line per field in before or after, in a fixed order (PostgreSQL's
 * jsonb keeps no order of its own). A field that shows the same on both
 * sides is left out: an unchanged value, or an empty setting of something
 * added or removed.
 */
export function describeChanges(
  before: Record<string, unknown> | null,
  after: Record<string, unknown> | null,
  names: NameLookup,
): ChangeLine[] {
  const keys = [
    ...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})]),
  ].sort(byFieldOrder);
  return keys
    .map((key) => line(key, before, after, names))
    .filter((l) => l.before !== l.after);
}

/** "Role: Energy manager; Name: …" — one side of the changes on one line. */
export function sideText(
  changes: readonly ChangeLine[],
  side: "before" | "after",
): string {
  return changes
    .filter((c) => c[side] !== NONE)
    .map((c) => `${c.field}: ${c[side]}`)
    .join("; ");
}
