/**
 * The house style for dates and numbers, in one place (British English,
 * `en-GB`). Pages, e-mails, the audit trail and the API's messages write
 * their dates and figures with these functions, so the same thing reads the
 * same everywhere.
 *
 * Dates:
 * - a month is "Nov 2026" in tables, charts and pickers, and "November 2026"
 *   in running text and headings (`monthShort`, `monthLong`);
 * - a day is "24 Nov 2026"; a moment is "24 Nov 2026, 08:05", 24-hour clock;
 * - a time not tied to a site is written in UTC and says so ("… 08:05 UTC"),
 *   because the server's and the browser's zones differ and React refuses
 *   to hydrate text that differs (error #418); a time that belongs to a site
 *   (its readings, its hours) is written in the site's zone;
 * - a relative time ("4 minutes ago") is measured from a `now` the loader
 *   sends, never from the clock of whichever machine renders it.
 *
 * Numbers: digits grouped ("12,345"), a real minus sign (−), a dash (—)
 * where there is no figure, and one precision per unit (`DECIMALS`; the ledger's units have theirs in
 * `~/ledger/ledger-units`). Money goes through Intl's currency style.
 *
 * Plain module: the server and the browser both use it.
 */
import { formatDistanceStrict } from "date-fns";

const LOCALE = "en-GB";
const MINUS = "\u2212";
/** What stands where a figure is missing or not a number. */
export const NO_FIGURE = "\u2014";

type Instant = Date | string | number;

// ---------------------------------------------------------------- dates --

/**
 * Month names are the house's own, not the locale data's: ICU versions
 * differ ("Sep" or "Sept"), and the server and the browser must write the
 * same text. Intl only finds an instant's calendar fields in a zone.
 */
const MONTH_NAMES = [
  "January",
  "February",
  "March",
  "April",
  "May",
  "June",
  "July",
  "August",
  "September",
  "October",
  "November",
  "December",
] as const;
const shortName = (month: number) => MONTH_NAMES[month - 1].slice(0, 3);

interface Fields {
  year: number;
  month: number;
  day: number;
  time: string;
  timeWithSeconds: string;
}

/** Intl formatters are costly to build: one per zone. */
const fieldFormats = new Map<string, Intl.DateTimeFormat>();

/** The calendar fields of an instant in a zone (the reader's when none is given). */
function fieldsIn(at: Instant, timeZone: string | undefined): Fields {
  const key = timeZone ?? "";
  let format = fieldFormats.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(LOCALE, {
      timeZone,
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
      hourCycle: "h23",
    });
    fieldFormats.set(key, format);
  }
  const part: Record<string, string> = {};
  for (const p of format.formatToParts(new Date(at))) part[p.type] = p.value;
  const time = `${part.hour}:${part.minute}`;
  return {
    year: Number(part.year),
    month: Number(part.month),
    day: Number(part.day),
    time,
    timeWithSeconds: `${time}:${part.second}`,
  };
}

/** `[year, month]` of a `YYYY-MM` month (or `YYYY-MM-DD` day); null for another shape. */
function yearMonth(month: string): [number, number] | null {
  const [y, m] = month.split("-").map(Number);
  return y && m >= 1 && m <= 12 ? [y, m] : null;
}

/** "Nov 2026" for `2026-11`: tables, charts, pickers. Another shape comes back as it is. */
export function monthShort(month: string): string {
  const ym = yearMonth(month);
  return ym ? `${shortName(ym[1])} ${ym[0]}` : month;
}

/** "November 2026" for `2026-11`: running text and headings. */
export function monthLong(month: string): string {
  const ym = yearMonth(month);
  return ym ? `${MONTH_NAMES[ym[1] - 1]} ${ym[0]}` : month;
}

const dayText = (f: Fields) => `${f.day} ${shortName(f.month)} ${f.year}`;

/** "24 Nov 2026" for a calendar day `2026-11-24`. Another shape comes back as it is. */
export function calendarDay(day: string): string {
  const [y, m, d] = day.split("-").map(Number);
  if (!y || !m || !d) return day;
  return dayIn(Date.UTC(y, m - 1, d), "UTC");
}

/** "5 Dec 2026", the UTC date of an instant. */
export function dayUtc(at: Instant): string {
  return dayIn(at, "UTC");
}

/** "5 Dec 2026, 08:08 UTC" (with `seconds`, "08:08:41 UTC"). */
export function dateTimeUtc(
  at: Instant,
  options: { seconds?: boolean } = {},
): string {
  const f = fieldsIn(at, "UTC");
  return `${dayText(f)}, ${options.seconds ? f.timeWithSeconds : f.time} UTC`;
}

/** "24 Nov 2026" in the given zone (a site's). */
export function dayIn(at: Instant, timeZone: string): string {
  return dayText(fieldsIn(at, timeZone));
}

/**
 * "24 Nov 2026, 08:05" in the given zone (a site's); the reader's own zone
 * when none is given, for what renders in the browser only.
 */
export function dateTimeIn(at: Instant, timeZone?: string): string {
  const f = fieldsIn(at, timeZone);
  return `${dayText(f)}, ${f.time}`;
}

/** "24 Nov, 08:05" in the given zone: a narrow column, where the year is plain. */
export function dayMonthTimeIn(at: Instant, timeZone: string): string {
  const f = fieldsIn(at, timeZone);
  return `${f.day} ${shortName(f.month)}, ${f.time}`;
}

/** "24 Nov" in the given zone: a chart's day tick. */
export function dayMonthIn(at: Instant, timeZone: string): string {
  const f = fieldsIn(at, timeZone);
  return `${f.day} ${shortName(f.month)}`;
}

/** "4 minutes ago" (or "in 4 minutes") of `at`, seen from `now`. */
export function timeAgo(at: Instant, now: Instant): string {
  return formatDistanceStrict(new Date(at), new Date(now), { addSuffix: true });
}

// -------------------------------------------------------------- numbers --

/**
 * Decimals shown per unit, outside the ledger (whose units carry their own).
 * An hour's energy keeps three (a meter's resolution); a total of many hours
 * is read in whole kWh or tenths of a MWh; temperatures, degree days and
 * percentages in tenths.
 */
export const DECIMALS = {
  hourKwh: 3,
  kWh: 0,
  MWh: 1,
  degreeDays: 1,
  celsius: 1,
  percent: 1,
} as const;

const numberFormats = new Map<string, Intl.NumberFormat>();

function numberFormat(min: number, max: number): Intl.NumberFormat {
  const key = `${min}-${max}`;
  let format = numberFormats.get(key);
  if (!format) {
    format = new Intl.NumberFormat(LOCALE, {
      minimumFractionDigits: min,
      maximumFractionDigits: max,
    });
    numberFormats.set(key, format);
  }
  return format;
}

/**
 * A number, grouped, with a real minus sign and no sign on a value that
 * rounds to zero; a dash when there is no figure (null, NaN, ∞).
 * `decimals` is the most shown; `fixed` shows exactly that many.
 */
export function formatNumber(
  value: number | null | undefined,
  decimals: number,
  options: { fixed?: boolean; plus?: boolean } = {},
): string {
  if (value === null || value === undefined || !Number.isFinite(value))
    return NO_FIGURE;
  const text = numberFormat(options.fixed ? decimals : 0, decimals).format(
    Math.abs(value),
  );
  if (!/[1-9]/.test(text)) return text;
  if (value < 0) return `${MINUS}${text}`;
  return options.plus && value > 0 ? `+${text}` : text;
}

/** A chart axis tick: as many decimals as the tick has, up to three ("2,500", "0.25"). */
export function formatTick(value: number): string {
  return formatNumber(value, 3);
}

/** A floor area, whole square metres: "12,400 m²". */
export function formatArea(m2: number): string {
  return `${formatNumber(m2, 0)} m²`;
}

/** A file's size in whole KiB: "1,234 KiB". */
export function formatKib(bytes: number): string {
  return `${formatCount(Math.round(bytes / 1024))} KiB`;
}

/** A count of things: "12,345". */
export function formatCount(count: number): string {
  return formatNumber(count, 0);
}

/** An hour's energy, at most three decimals: "1,234.567". */
export function formatHourKwh(kwh: number, minimumDecimals = 0): string {
  return numberFormat(
    minimumDecimals,
    Math.max(DECIMALS.hourKwh, minimumDecimals),
  )
    .format(kwh)
    .replace(/^-/, MINUS);
}

/** A total in whole kWh: "1,234 kWh"; a dash alone when there is none. */
export function formatKwh(
  kwh: number | null,
  options: { plus?: boolean } = {},
): string {
  const text = formatNumber(kwh, DECIMALS.kWh, options);
  return text === NO_FIGURE ? text : `${text} kWh`;
}

/** A total in MWh, one decimal: "1,234.5 MWh". */
export function formatMwh(mwh: number, options: { plus?: boolean } = {}) {
  return `${formatNumber(mwh, DECIMALS.MWh, options)} MWh`;
}

/**
 * A total of energy at the scale it reads best: below 1,000 kWh in kWh,
 * from there in MWh ("+1.2 MWh", "−850 kWh").
 */
export function formatEnergy(
  kwh: number,
  options: { plus?: boolean } = {},
): string {
  return Math.abs(kwh) >= 1000
    ? formatMwh(kwh / 1000, options)
    : formatKwh(kwh, options);
}

/** Degree days, one decimal: "312.5 degree days". */
export function formatDegreeDays(value: number): string {
  return `${formatNumber(value, DECIMALS.degreeDays)} degree days`;
}

/** A temperature, one decimal, kept with its unit: "15.5 °C" (no-break space). */
export function formatCelsius(celsius: number): string {
  return `${formatNumber(celsius, DECIMALS.celsius, { fixed: true })}\u00a0°C`;
}

type PercentOptions = { decimals?: number; plus?: boolean };

/** A fraction as a percentage, one decimal: 0.1234 → "12.3 %"; a dash when there is none. */
export function formatPercent(
  fraction: number | null,
  options: PercentOptions = {},
): string {
  return formatPercentPoints(
    fraction === null ? null : fraction * 100,
    options,
  );
}

/**
 * A figure that is already a percentage (a statistic's CV(RMSE), a saving's
 * share): 12.34 → "12.3 %"; a dash when there is none.
 */
export function formatPercentPoints(
  percent: number | null,
  options: PercentOptions = {},
): string {
  const decimals = options.decimals ?? DECIMALS.percent;
  const text = formatNumber(percent, decimals, {
    fixed: true,
    plus: options.plus,
  });
  return text === NO_FIGURE ? text : `${text} %`;
}

/** Money held in minor units (pence, cents): 12345, "gbp" → "£123.45". */
export function formatMoney(minor: number, currency: string): string {
  return currencyFormat(currency).format(minor / 100);
}

// Made once per currency: building an Intl.NumberFormat costs far more than
// formatting with it, and a page may show hundreds of amounts.
const currencyFormats = new Map<string, Intl.NumberFormat>();

function currencyFormat(currency: string): Intl.NumberFormat {
  const code = currency.toUpperCase();
  let format = currencyFormats.get(code);
  if (!format) {
    format = new Intl.NumberFormat(LOCALE, {
      style: "currency",
      currency: code,
    });
    currencyFormats.set(code, format);
  }
  return format;
}

/** An exact decimal as a person would type it: "250000.000000" → "250000". No float. */
export function decimalAsTyped(decimal: string): string {
  return decimal.includes(".") ? decimal.replace(/\.?0+$/, "") : decimal;
}

/** An exact decimal amount in its currency, to the currency's places: "1234.5678", "GBP" → "£1,234.57". */
export function formatCost(decimal: string, currency: string): string {
  return currencyFormat(currency).format(Number(decimal));
}
