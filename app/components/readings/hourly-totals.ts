import type { Interval } from "./use-intervals";

const HOUR_MS = 3_600_000;

/** Worst first: an hour is only as good as its least certain part. */
const qualityRank: Record<Interval["quality"], number> = {
  measured: 0,
  edited: 1,
  estimated: 2,
  missing: 3,
};

/**
 * A meter's intervals as hours, for the charts (load profile and carpet),
 * which read in hours whatever the meter's resolution. Each hour's energy is
 * the sum of its intervals (kWh add; nothing is averaged) and its quality is
 * the worst of its parts, so an hour with one estimated half-hour shows as
 * estimated, never as actual. Hourly intervals come back as they are. The
 * interval table keeps the native intervals, so one can be corrected.
 */
export function hourlyTotals(intervals: readonly Interval[]): Interval[] {
  const hours = new Map<number, Interval>();
  for (const i of intervals) {
    const t = Date.parse(i.start);
    const hour = t - (((t % HOUR_MS) + HOUR_MS) % HOUR_MS);
    const sofar = hours.get(hour);
    if (!sofar) {
      hours.set(hour, {
        ...i,
        start: new Date(hour).toISOString().replace(".000Z", "Z"),
        end: new Date(hour + HOUR_MS).toISOString().replace(".000Z", "Z"),
        flags: [...i.flags],
      });
      continue;
    }
    // Decimal strings of six places: summed in millionths, so exactly.
    sofar.energy_kwh = addKwh(sofar.energy_kwh, i.energy_kwh);
    if (qualityRank[i.quality] > qualityRank[sofar.quality])
      sofar.quality = i.quality;
    for (const f of i.flags) if (!sofar.flags.includes(f)) sofar.flags.push(f);
    sofar.source_count += i.source_count;
  }
  return [...hours.entries()].sort(([a], [b]) => a - b).map(([, h]) => h);
}

/** The sum of two kWh decimals, to the six places the API gives. */
export function addKwh(a: string, b: string): string {
  const micro = toMicro(a) + toMicro(b);
  const sign = micro < 0n ? "-" : "";
  const abs = micro < 0n ? -micro : micro;
  const whole = abs / 1_000_000n;
  const fraction = (abs % 1_000_000n).toString().padStart(6, "0");
  return `${sign}${whole}.${fraction}`;
}

function toMicro(kwh: string): bigint {
  const negative = kwh.startsWith("-");
  const [whole, fraction = ""] = kwh.replace(/^[-+]/, "").split(".");
  const micro =
    BigInt(whole || "0") * 1_000_000n +
    BigInt((fraction + "000000").slice(0, 6));
  return negative ? -micro : micro;
}
