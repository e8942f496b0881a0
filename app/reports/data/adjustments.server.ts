/**
 * The adjusting entries recorded against the period's months: every change
 * to a closed month, with who made it, why and when.
 */
import type pg from "pg";
import { pool } from "~/db/client.server";
import type { ReportPeriod } from "../periods";
import type { AdjustmentEntry, Carrier } from "./types";

// Raw SQL, on purpose: one of loadReportData's loads, measured by `npm run bench reports`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export async function periodAdjustments(
  organizationId: string,
  siteId: string | null,
  period: ReportPeriod,
  readPool: pg.Pool = pool,
): Promise<AdjustmentEntry[]> {
  const { rows } = await readPool.query<{
    id: string;
    created_at: Date;
    month: string;
    site_name: string;
    code: string;
    meter_name: string;
    carrier: Carrier;
    sub_meter: boolean;
    delta_kwh: string;
    source: string;
    reason: string;
    person: string | null;
    gateway: string | null;
  }>(
    `select a.id::text as id, a.created_at, to_char(a.month, 'YYYY-MM') as month,
            s.name as site_name, m.code, m.name as meter_name, m.carrier::text as carrier,
            m.parent_meter_id is not null as sub_meter,
            a.delta_kwh::text, a.source, a.reason,
            u.name as person, g.name as gateway
       from ledger_adjustments a
       join meters m on m.organization_id = a.organization_id and m.id = a.meter_id
       join sites s on s.organization_id = m.organization_id and s.id = m.site_id
       left join users u on u.id = a.actor_user_id
       left join gateways g on g.organization_id = a.organization_id and g.id = a.gateway_id
      where a.organization_id = $1
        and a.month >= $2::date and a.month < $3::date
        and ($4::uuid is null or s.id = $4::uuid)
      order by a.created_at, a.id`,
    [organizationId, period.start, period.end, siteId],
  );
  return rows.map((r) => ({
    id: Number(r.id),
    recordedAt: r.created_at.toISOString(),
    month: r.month,
    siteName: r.site_name,
    meterCode: r.code,
    meterName: r.meter_name,
    carrier: r.carrier,
    subMeter: r.sub_meter,
    deltaKwh: r.delta_kwh,
    source: r.source,
    reason: r.reason,
    // Neither a person nor a gateway: the app itself (re-estimated gaps).
    author: r.person ?? (r.gateway ? `Gateway ${r.gateway}` : "Automatic"),
  }));
}
