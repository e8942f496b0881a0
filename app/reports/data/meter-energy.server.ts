/**
 * Every meter's signed energy over the period, from the monthly rollups as
 * they stand (sub-meters included), for the sub-meter residuals.
 */
import type pg from "pg";
import { pool } from "~/db/client.server";
import type { ReportPeriod } from "../periods";
import type { MeterPeriodEnergy } from "./period-balance";
import type { Carrier } from "./types";

// Raw SQL, on purpose: one of loadReportData's loads, measured by `npm run bench reports`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export async function meterPeriodEnergy(
  organizationId: string,
  siteId: string | null,
  period: ReportPeriod,
  readPool: pg.Pool = pool,
): Promise<MeterPeriodEnergy[]> {
  const { rows } = await readPool.query<{
    id: string;
    site_id: string;
    code: string;
    name: string;
    carrier: Carrier;
    parent_meter_id: string | null;
    energy_kwh: string;
  }>(
    `select m.id, m.site_id, m.code, m.name, m.carrier::text as carrier, m.parent_meter_id,
            sum(r.energy_kwh)::text as energy_kwh
       from monthly_rollups r
       join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
      where r.organization_id = $1
        and r.month >= $2::date and r.month < $3::date
        and ($4::uuid is null or m.site_id = $4::uuid)
      group by m.id, m.site_id, m.code, m.name, m.carrier, m.parent_meter_id`,
    [organizationId, period.start, period.end, siteId],
  );
  return rows.map((r) => ({
    id: r.id,
    siteId: r.site_id,
    code: r.code,
    name: r.name,
    carrier: r.carrier,
    parentMeterId: r.parent_meter_id,
    energyKwh: r.energy_kwh,
  }));
}
