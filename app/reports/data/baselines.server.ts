/**
 * The saved baselines in force (the newest per site and carrier) and the
 * daily weather of the report's sites, each in one query for all sites.
 */
import type { DailyTemperature } from "~/baselines/degree-days";
import type { StoredModel } from "~/baselines/regression";
import type pg from "pg";
import { pool } from "~/db/client.server";
import type { ReportPeriod } from "../periods";
import type { SavedBaselineRow } from "./baseline-comparison";
import type { Carrier } from "./types";

// Raw SQL, on purpose: one of loadReportData's loads, measured by `npm run bench reports`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export async function baselinesInForce(
  organizationId: string,
  siteIds: readonly string[],
  readPool: pg.Pool = pool,
): Promise<Map<string, SavedBaselineRow[]>> {
  const { rows } = await readPool.query<{
    id: string;
    site_id: string;
    carrier: Carrier;
    period_from: string;
    period_to: string;
    granularity: string;
    model: StoredModel;
    created_at: Date;
    created_by: string | null;
  }>(
    `select distinct on (b.site_id, b.carrier)
            b.id, b.site_id, b.carrier::text as carrier,
            to_char(b.period_from, 'YYYY-MM') as period_from,
            to_char(b.period_to, 'YYYY-MM') as period_to,
            b.granularity, b.model, b.created_at, u.name as created_by
       from baselines b
       left join users u on u.id = b.created_by_user_id
      where b.organization_id = $1 and b.site_id = any($2::uuid[])
      order by b.site_id, b.carrier, b.created_at desc`,
    [organizationId, siteIds],
  );
  const bySite = new Map<string, SavedBaselineRow[]>();
  for (const r of rows) {
    const list = bySite.get(r.site_id) ?? [];
    list.push({
      id: r.id,
      carrier: r.carrier,
      from: r.period_from,
      to: r.period_to,
      granularity: r.granularity === "daily" ? "daily" : "monthly",
      model: r.model,
      createdAt: r.created_at.toISOString(),
      createdBy: r.created_by,
    });
    bySite.set(r.site_id, list);
  }
  return bySite;
}

/** Daily mean temperatures of the sites, over the period's days. */
export async function periodTemperatures(
  organizationId: string,
  siteIds: readonly string[],
  period: ReportPeriod,
  readPool: pg.Pool = pool,
): Promise<Map<string, DailyTemperature[]>> {
  const { rows } = await readPool.query<{
    site_id: string;
    day: string;
    t: string;
  }>(
    `select site_id, to_char(day, 'YYYY-MM-DD') as day, mean_temp_c::text as t
       from daily_weather
      where organization_id = $1 and site_id = any($2::uuid[])
        and day >= $3::date and day < $4::date
      order by site_id, day`,
    [organizationId, siteIds, period.start, period.end],
  );
  const bySite = new Map<string, DailyTemperature[]>();
  for (const r of rows) {
    const list = bySite.get(r.site_id) ?? [];
    list.push({ day: r.day, meanTempC: Number(r.t) });
    bySite.set(r.site_id, list);
  }
  return bySite;
}
