/**
 * Daily weather per site: stored from uploads (all rows or none) and from
 * the demo seed, and summed into monthly degree days in the site's months.
 */
import { recordAuditWith } from "~/audit/record-audit.server";
import { pool } from "~/db/client.server";
import {
  monthlyDegreeDays,
  type DailyTemperature,
  type MonthlyDegreeDays,
} from "./degree-days";
import type { WeatherRow } from "./weather-csv";

function lastDayOf(month: string): string {
  const [y, m] = month.split("-").map(Number);
  return new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
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
  const days = args.rows.map((r) => r.day);
  const temps = args.rows.map((r) => r.meanTempC.toFixed(2));
  const sorted = [...days].sort();
  const from = sorted[0];
  const to = sorted.at(-1)!;
  const client = await pool.connect();
  try {
    await client.query("begin");
    const { rows } = await client.query<{ inserted: boolean }>(
      `insert into daily_weather (organization_id, site_id, day, mean_temp_c, source)
       select $1, $2, d, t, 'upload' from unnest($3::date[], $4::numeric[]) as u(d, t)
       on conflict (organization_id, site_id, day) do update set
         mean_temp_c = excluded.mean_temp_c, source = 'upload', updated_at = now()
       returning (xmax = 0) as inserted`,
      [args.organizationId, args.siteId, days, temps],
    );
    const inserted = rows.filter((r) => r.inserted).length;
    const result = { inserted, updated: rows.length - inserted, from, to };
    await recordAuditWith(client, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "weather.uploaded",
      subject: args.siteId,
      siteId: args.siteId,
      after: result,
    });
    await client.query("commit");
    return result;
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}

/** The seed's weather: only days the site does not have yet. */
export async function insertSeedWeather(args: {
  organizationId: string;
  siteId: string;
  rows: readonly WeatherRow[];
}): Promise<number> {
  const { rowCount } = await pool.query(
    `insert into daily_weather (organization_id, site_id, day, mean_temp_c, source)
     select $1, $2, d, t, 'seed' from unnest($3::date[], $4::numeric[]) as u(d, t)
     on conflict (organization_id, site_id, day) do nothing`,
    [
      args.organizationId,
      args.siteId,
      args.rows.map((r) => r.day),
      args.rows.map((r) => r.meanTempC.toFixed(2)),
    ],
  );
  return rowCount ?? 0;
}

/** Daily mean temperatures of a site in the months from `from` to `to`. */
export async function dailyTemperatures(args: {
  organizationId: string;
  siteId: string;
  from: string;
  to: string;
}): Promise<DailyTemperature[]> {
  const { rows } = await pool.query<{ day: string; t: string }>(
    `select to_char(day, 'YYYY-MM-DD') as day, mean_temp_c::text as t
       from daily_weather
      where organization_id = $1 and site_id = $2 and day between $3::date and $4::date
      order by day`,
    [args.organizationId, args.siteId, `${args.from}-01`, lastDayOf(args.to)],
  );
  return rows.map((r) => ({ day: r.day, meanTempC: Number(r.t) }));
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
  const { rows } = await pool.query<{
    first: string | null;
    last: string | null;
    days: number;
  }>(
    `select to_char(min(day), 'YYYY-MM-DD') as first, to_char(max(day), 'YYYY-MM-DD') as last,
            count(*)::int as days
       from daily_weather where organization_id = $1 and site_id = $2`,
    [args.organizationId, args.siteId],
  );
  return rows[0];
}
