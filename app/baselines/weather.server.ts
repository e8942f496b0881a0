/**
 * Daily weather per site: stored from uploads (all rows or none) and from
 * the demo seed, and summed into monthly degree days in the site's months.
 */
import { and, between, count, eq, inArray, max, min, sql } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { dailyWeather } from "~/db/schema";
import { recomputeSiteWeather } from "~/exergy/exergy-store.server";
import {
  monthlyDegreeDays,
  type DailyTemperature,
  type MonthlyDegreeDays,
} from "./degree-days";
import type { WeatherRow } from "./weather-csv";

/** The last calendar day (YYYY-MM-DD) of a YYYY-MM month. */
export function lastDayOf(month: string): string {
  const [y, m] = month.split("-").map(Number);
  return new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
}

/** The key a site's day is stored under, for upserts. */
const dayKey = [
  dailyWeather.organizationId,
  dailyWeather.siteId,
  dailyWeather.day,
];

/**
 * Rows per insert: five parameters each keeps a statement well under
 * PostgreSQL's 65,535 bind parameters, whatever an upload's length.
 */
const ROWS_PER_INSERT = 5_000;

function* chunksOf<T>(rows: readonly T[]): Generator<readonly T[]> {
  for (let at = 0; at < rows.length; at += ROWS_PER_INSERT)
    yield rows.slice(at, at + ROWS_PER_INSERT);
}

function weatherRows(
  site: { organizationId: string; siteId: string },
  rows: readonly WeatherRow[],
  source: "upload" | "seed",
) {
  return rows.map((r) => ({
    organizationId: site.organizationId,
    siteId: site.siteId,
    day: r.day,
    meanTempC: r.meanTempC.toFixed(2),
    source,
  }));
}

function ofSite(site: { organizationId: string; siteId: string }) {
  return and(
    eq(dailyWeather.organizationId, site.organizationId),
    eq(dailyWeather.siteId, site.siteId),
  );
}

export interface StoredWeather {
  inserted: number;
  updated: number;
  from: string;
  to: string;
}

/**
 * Upserts a checked upload for one site in one transaction, recorded in the
 * audit log. A day already stored takes the uploaded value.
 */
export async function storeWeather(args: {
  organizationId: string;
  siteId: string;
  actorUserId: string;
  rows: readonly WeatherRow[];
}): Promise<StoredWeather> {
  if (args.rows.length === 0) throw new RangeError("no weather rows");
  const sorted = args.rows.map((r) => r.day).sort();
  const from = sorted[0];
  const to = sorted.at(-1)!;
  return db.transaction(async (tx) => {
    let inserted = 0;
    let updated = 0;
    for (const chunk of chunksOf(args.rows)) {
      const written = await tx
        .insert(dailyWeather)
        .values(weatherRows(args, chunk, "upload"))
        .onConflictDoUpdate({
          target: dayKey,
          set: {
            meanTempC: sql`excluded.mean_temp_c`,
            source: "upload",
            updatedAt: sql`now()`,
          },
        })
        // xmax is 0 on a row this statement inserted, set on one it updated.
        .returning({ inserted: sql<boolean>`(xmax = 0)` });
      const fresh = written.filter((r) => r.inserted).length;
      inserted += fresh;
      updated += written.length - fresh;
    }
    const result = { inserted, updated, from, to };
    // The days' outdoor means are the dead state of their heat's exergy.
    await recomputeSiteWeather(tx, { ...args, from, to });
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "weather.uploaded",
      subject: args.siteId,
      siteId: args.siteId,
      after: result,
    });
    return result;
  });
}

/** The seed's weather: only days the site does not have yet. */
export async function insertSeedWeather(args: {
  organizationId: string;
  siteId: string;
  rows: readonly WeatherRow[];
}): Promise<number> {
  let stored = 0;
  for (const chunk of chunksOf(args.rows)) {
    const written = await db
      .insert(dailyWeather)
      .values(weatherRows(args, chunk, "seed"))
      .onConflictDoNothing({ target: dayKey })
      .returning({ day: dailyWeather.day });
    stored += written.length;
  }
  if (stored > 0) {
    const days = args.rows.map((r) => r.day).sort();
    await recomputeSiteWeather(db, {
      ...args,
      from: days[0],
      to: days.at(-1)!,
    });
  }
  return stored;
}

/** Daily mean temperatures of a site in the months from `from` to `to`. */
export async function dailyTemperatures(args: {
  organizationId: string;
  siteId: string;
  from: string;
  to: string;
}): Promise<DailyTemperature[]> {
  const rows = await db
    .select({ day: dailyWeather.day, t: dailyWeather.meanTempC })
    .from(dailyWeather)
    .where(
      and(
        ofSite(args),
        between(dailyWeather.day, `${args.from}-01`, lastDayOf(args.to)),
      ),
    )
    .orderBy(dailyWeather.day);
  return rows.map((r) => ({ day: r.day, meanTempC: Number(r.t) }));
}

/**
 * `dailyTemperatures` of several sites from one query: each site's days in
 * the same order, so degree days summed from them are the same to the bit.
 */
export async function dailyTemperaturesOfSites(args: {
  organizationId: string;
  siteIds: string[];
  from: string;
  to: string;
}): Promise<Map<string, DailyTemperature[]>> {
  const bySite = new Map<string, DailyTemperature[]>(
    args.siteIds.map((id) => [id, []]),
  );
  if (args.siteIds.length === 0) return bySite;
  const rows = await db
    .select({
      siteId: dailyWeather.siteId,
      day: dailyWeather.day,
      t: dailyWeather.meanTempC,
    })
    .from(dailyWeather)
    .where(
      and(
        eq(dailyWeather.organizationId, args.organizationId),
        inArray(dailyWeather.siteId, args.siteIds),
        between(dailyWeather.day, `${args.from}-01`, lastDayOf(args.to)),
      ),
    )
    .orderBy(dailyWeather.siteId, dailyWeather.day);
  for (const r of rows)
    bySite.get(r.siteId)!.push({ day: r.day, meanTempC: Number(r.t) });
  return bySite;
}

/**
 * Monthly HDD and CDD of a site: the sum of each day's degree days over the
 * days of the site-local month, to the given base temperature.
 */
export async function siteMonthlyDegreeDays(args: {
  organizationId: string;
  siteId: string;
  baseC: number;
  from: string;
  to: string;
}): Promise<MonthlyDegreeDays[]> {
  const temperatures = await dailyTemperatures(args);
  return monthlyDegreeDays(temperatures, args.baseC, args);
}

/** The first and last day with weather, and how many days a site has. */
export async function weatherCoverage(args: {
  organizationId: string;
  siteId: string;
}): Promise<{ first: string | null; last: string | null; days: number }> {
  const [coverage] = await db
    .select({
      first: min(dailyWeather.day),
      last: max(dailyWeather.day),
      days: count(),
    })
    .from(dailyWeather)
    .where(ofSite(args));
  return coverage;
}
