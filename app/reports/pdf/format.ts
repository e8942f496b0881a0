/**
 * How figures read in a report. Energy from the ledger is formatted from
 * its decimal string (no binary rounding), with thousands separators and a
 * sign: + into the site, − (a true minus) out of it, as on the Ledger page.
 */
import { formatDecimal } from "~/ledger/balance";

/** Ledger kWh, signed, one decimal: "+12,345.6", "−410.0", "0.0". */
export function kwh(value: string): string {
  return formatDecimal(value, 1);
}

/** An unsigned magnitude (a band or a model figure), one decimal. */
export function magnitude(value: number | string, digits = 1): string {
  const text =
    typeof value === "string"
      ? value.trim().replace(/^[+\-\u2212]/, "")
      : Math.abs(value).toFixed(digits);
  return formatDecimal(text, digits).replace(/^\+/, "");
}

/** A model figure (a number), signed like ledger figures. */
export function signedNumber(value: number, digits = 1): string {
  return formatDecimal(value.toFixed(digits), digits);
}

/** "± 1,234.5" for an EN 1434 band; "—" without one. */
export function band(value: string | null): string {
  return value === null ? "—" : `±${magnitude(value)}`;
}

/** A share 0…1 as "12.3 %"; a tiny non-zero share shows as "< 0.1 %". */
export function share(value: number | null, digits = 1): string {
  if (value === null || !Number.isFinite(value)) return "—";
  const percent = 100 * value;
  const sign = percent < 0 ? "\u2212" : "";
  if (percent !== 0 && Math.abs(percent) < 0.5 * 10 ** -digits)
    return `${sign}< ${(10 ** -digits).toFixed(digits)} %`;
  const text = Math.abs(percent).toFixed(digits);
  return `${Number(text) === 0 ? "" : sign}${text} %`;
}

/** A percentage already in %, signed: "+2.3 %", "−0.4 %". */
export function signedPercent(value: number | null, digits = 1): string {
  if (value === null || !Number.isFinite(value)) return "—";
  return `${formatDecimal(value.toFixed(digits), digits)} %`;
}

/** A conversion factor: nine significant digits, grouped, no trailing zeros. */
export function factor(value: number): string {
  const [whole, fraction] = Number(value.toPrecision(9)).toString().split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return fraction ? `${grouped}.${fraction}` : grouped;
}

export function integer(value: number): string {
  return Math.round(value)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

/** "2 December 2026, 01:03 GMT" in the given zone. */
export function dateTime(iso: string, timeZone: string): string {
  const date = new Date(iso);
  const day = new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "long",
    year: "numeric",
    timeZone,
  }).format(date);
  const time = new Intl.DateTimeFormat("en-GB", {
    hour: "2-digit",
    minute: "2-digit",
    timeZone,
    timeZoneName: "short",
  }).format(date);
  return `${day}, ${time}`;
}

/** "2026-12-02 01:03" in the given zone, for table cells. */
export function compactDateTime(iso: string, timeZone: string): string {
  const parts = new Intl.DateTimeFormat("en-GB", {
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
    timeZone,
  }).formatToParts(new Date(iso));
  const get = (type: string) => parts.find((p) => p.type === type)?.value;
  return `${get("year")}-${get("month")}-${get("day")} ${get("hour")}:${get("minute")}`;
}
