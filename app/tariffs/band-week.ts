/**
 * Time bands of a tariff as a week of quarter hours. A band's windows are
 * written the way a tariff sheet writes them, e.g. "Mon-Fri 07:00-23:00" or
 * "Mon-Sun 23:00-07:00" (a window ending at or before its start runs on into
 * the next day). Times are on the quarter hour, so an interval of 15, 30 or
 * 60 minutes splits into whole quarters and its energy into exact halves or
 * quarters, in any time zone (every offset is a multiple of 15 minutes).
 */

export const QUARTERS_PER_DAY = 96;
export const QUARTERS_PER_WEEK = 7 * QUARTERS_PER_DAY;

export const weekdayNames = [
  "Mon",
  "Tue",
  "Wed",
  "Thu",
  "Fri",
  "Sat",
  "Sun",
] as const;

export interface BandInput {
  name: string;
  windows: string;
}

/** For each quarter of the week from Monday 00:00 local, the index of its band. */
export type BandWeek = Uint8Array;

type Parsed<T> = { ok: true; value: T } | { ok: false; reason: string };

function dayIndex(name: string): number {
  return weekdayNames.findIndex(
    (d) => d.toLowerCase() === name.slice(0, 3).toLowerCase(),
  );
}

function quarterOf(time: string): number | null {
  const match = /^(\d{1,2}):(\d{2})$/.exec(time);
  if (!match) return null;
  const hours = Number(match[1]);
  const minutes = Number(match[2]);
  if (minutes % 15 !== 0 || minutes >= 60) return null;
  if (hours > 24 || (hours === 24 && minutes !== 0)) return null;
  return hours * 4 + minutes / 15;
}

export interface BandWindow {
  days: number[];
  fromQuarter: number;
  toQuarter: number;
}

const windowPattern =
  /^([A-Za-z]{3,9})(?:\s*[-–]\s*([A-Za-z]{3,9}))?\s+(\d{1,2}:\d{2})\s*[-–]\s*(\d{1,2}:\d{2})$/;

/** "Mon-Fri 07:00-23:00" → its days and quarters, or why it cannot be read. */
export function parseWindow(text: string): Parsed<BandWindow> {
  const match = windowPattern.exec(text.trim());
  if (!match)
    return {
      ok: false,
      reason: `"${text.trim()}" is not a window like "Mon-Fri 07:00-23:00".`,
    };
  const first = dayIndex(match[1]);
  const last = match[2] === undefined ? first : dayIndex(match[2]);
  if (first < 0 || last < 0)
    return { ok: false, reason: `"${text.trim()}": unknown day name.` };
  const fromQuarter = quarterOf(match[3]);
  const toQuarter = quarterOf(match[4]);
  if (fromQuarter === null || toQuarter === null || fromQuarter === 96)
    return {
      ok: false,
      reason: `"${text.trim()}": times must be on the quarter hour, 00:00 to 24:00.`,
    };
  const days: number[] = [];
  for (let d = first; ; d = (d + 1) % 7) {
    days.push(d);
    if (d === last) break;
  }
  return { ok: true, value: { days, fromQuarter, toQuarter } };
}

/** The quarters of the week one window covers (a window to 00:00 or earlier runs past midnight). */
function quartersOf(window: BandWindow): number[] {
  const length =
    window.toQuarter > window.fromQuarter
      ? window.toQuarter - window.fromQuarter
      : QUARTERS_PER_DAY - window.fromQuarter + window.toQuarter;
  const quarters: number[] = [];
  for (const day of window.days) {
    const start = day * QUARTERS_PER_DAY + window.fromQuarter;
    for (let q = 0; q < length; q++)
      quarters.push((start + q) % QUARTERS_PER_WEEK);
  }
  return quarters;
}

export function quarterLabel(quarter: number): string {
  const day = weekdayNames[Math.floor(quarter / QUARTERS_PER_DAY) % 7];
  const inDay = quarter % QUARTERS_PER_DAY;
  const hh = String(Math.floor(inDay / 4)).padStart(2, "0");
  const mm = String((inDay % 4) * 15).padStart(2, "0");
  return `${day} ${hh}:${mm}`;
}

/** Runs of consecutive quarters, written "Mon 07:00 to Mon 08:00". */
function runs(quarters: number[]): string[] {
  const out: string[] = [];
  let start = -1;
  for (let i = 0; i < quarters.length; i++) {
    if (start < 0) start = quarters[i];
    const next = quarters[i + 1];
    if (next !== quarters[i] + 1) {
      out.push(`${quarterLabel(start)} to ${quarterLabel(quarters[i] + 1)}`);
      start = -1;
    }
  }
  return out;
}

/**
 * The week the bands make, refused unless every quarter hour of the week is
 * in exactly one band: a gap would leave energy without a price, an overlap
 * would price it twice.
 */
export function bandWeek(bands: readonly BandInput[]): Parsed<BandWeek> {
  if (bands.length === 0)
    return { ok: false, reason: "A tariff needs at least one time band." };
  if (bands.length > 250)
    return { ok: false, reason: "At most 250 time bands." };
  const owner = new Int16Array(QUARTERS_PER_WEEK).fill(-1);
  const overlaps: number[] = [];
  const overlapBands = new Set<string>();
  for (const [index, band] of bands.entries()) {
    const texts = band.windows
      .split(/[;,\n]/)
      .map((t) => t.trim())
      .filter(Boolean);
    if (texts.length === 0)
      return { ok: false, reason: `Band "${band.name}" has no windows.` };
    for (const text of texts) {
      const window = parseWindow(text);
      if (!window.ok)
        return { ok: false, reason: `Band "${band.name}": ${window.reason}` };
      for (const q of quartersOf(window.value)) {
        if (owner[q] >= 0) {
          overlaps.push(q);
          overlapBands.add(bands[owner[q]].name).add(band.name);
        } else owner[q] = index;
      }
    }
  }
  if (overlaps.length > 0) {
    const sorted = [...new Set(overlaps)].sort((a, b) => a - b);
    return {
      ok: false,
      reason: `The bands overlap (${[...overlapBands].join(", ")}): ${runs(sorted).slice(0, 3).join("; ")}. Each quarter hour of the week must be in exactly one band.`,
    };
  }
  const gaps: number[] = [];
  owner.forEach((o, q) => {
    if (o < 0) gaps.push(q);
  });
  if (gaps.length > 0)
    return {
      ok: false,
      reason: `The bands do not cover the whole week: no band for ${runs(gaps).slice(0, 3).join("; ")}.`,
    };
  return { ok: true, value: Uint8Array.from(owner) };
}
