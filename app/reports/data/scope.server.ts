/**
 * Who and what a report covers: the organisation, its sites (one or all),
 * and the month closes in force for the period.
 */
import type pg from "pg";
import { pool } from "~/db/client.server";
import type { ReportPeriod } from "../periods";
import type { ActiveClose } from "./ledger-tables";

// Raw SQL, on purpose: one of loadReportData's loads, measured by `npm run bench reports`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export interface ScopeSite {
  id: string;
  name: string;
  timeZone: string;
  degreeDayBaseC: number;
  floorAreaM2: number | null;
  archived: boolean;
}

export async function organizationName(
  organizationId: string,
  readPool: pg.Pool = pool,
) {
  const { rows } = await readPool.query<{ name: string }>(
    "select name from organizations where id = $1",
    [organizationId],
  );
  if (!rows[0]) throw new Error("No such organisation.");
  return rows[0].name;
}

/**
 * The site asked for, or every site of the organisation; archived sites
 * too, since the ledger still holds their months.
 */
export async function scopeSites(
  organizationId: string,
  siteId: string | null,
  readPool: pg.Pool = pool,
): Promise<ScopeSite[]> {
  const { rows } = await readPool.query<{
    id: string;
    name: string;
    time_zone: string;
    degree_day_base_c: string;
    floor_area_m2: string | null;
    archived: boolean;
  }>(
    `select id, name, time_zone, degree_day_base_c::text, floor_area_m2::text,
            archived_at is not null as archived
       from sites
      where organization_id = $1 and ($2::uuid is null or id = $2::uuid)
      order by name`,
    [organizationId, siteId],
  );
  if (siteId && rows.length === 0) throw new Error("No such site.");
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    timeZone: r.time_zone,
    degreeDayBaseC: Number(r.degree_day_base_c),
    floorAreaM2: r.floor_area_m2 === null ? null : Number(r.floor_area_m2),
    archived: r.archived,
  }));
}

/** Closes not reopened, for the organisation or a site, in the period. */
export async function activeCloses(
  organizationId: string,
  period: ReportPeriod,
  readPool: pg.Pool = pool,
): Promise<ActiveClose[]> {
  const { rows } = await readPool.query<{
    site_id: string | null;
    month: string;
  }>(
    `select site_id, to_char(month, 'YYYY-MM') as month
       from month_closes
      where organization_id = $1 and reopened_at is null
        and month >= $2::date and month < $3::date`,
    [organizationId, period.start, period.end],
  );
  return rows.map((r) => ({ siteId: r.site_id, month: r.month }));
}
