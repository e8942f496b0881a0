import type { PoolClient } from "pg";
import { pool } from "~/db/client.server";

/** Who or what changed the intervals: recorded on any adjusting entry. */
export interface ChangeAttribution {
  source: "late_data" | "edit" | "estimate";
  reason: string;
  actorUserId?: string | null;
  gatewayId?: string | null;
}

/**
 * Recomputes one meter's rollups for the site-local months that the UTC range
 * [from, to) touches (`to` is an end: a reading ending at midnight on the 1st
 * belongs to the month before), from that meter's intervals in those months only (the
 * ledger never sums intervals on a page view). Sums are PostgreSQL numeric:
 * a month equals the sum of its hours to the last stored digit. When a month
 * is closed, the change is written as an adjusting entry in the same
 * statement, so it can never be silent.
 */
export async function refreshRollups(
  client: PoolClient,
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
  change: ChangeAttribution,
): Promise<number> {
  const { rows } = await client.query<{ adjustments: number }>(
    `with target as (
       select m.id as meter_id, m.site_id, s.time_zone as tz, gs::date as month
         from meters m
         join sites s on s.organization_id = m.organization_id and s.id = m.site_id
        cross join lateral generate_series(
                date_trunc('month', $3::timestamptz at time zone s.time_zone),
                date_trunc('month', greatest($3::timestamptz, $4::timestamptz - interval '1 millisecond') at time zone s.time_zone),
                interval '1 month') gs
        where m.organization_id = $1 and m.id = $2
     ), sums as (
       select t.meter_id, t.site_id, t.month,
              coalesce(sum(i.energy_kwh), 0) as energy_kwh,
              coalesce(sum(i.energy_kwh) filter (where i.quality = 'estimated'), 0) as estimated_kwh,
              coalesce(sum(i.uncertainty_kwh), 0) as uncertainty_kwh,
              count(i.hour_start)::int as hours,
              (count(i.hour_start) filter (where i.quality = 'estimated'))::int as estimated_hours
         from target t
         left join intervals i
           on i.organization_id = $1 and i.meter_id = t.meter_id
          and i.hour_start >= (t.month::timestamp at time zone t.tz)
          and i.hour_start < ((t.month + interval '1 month')::timestamp at time zone t.tz)
        group by t.meter_id, t.site_id, t.month
     ), old as (
       select r.meter_id, r.month, r.energy_kwh
         from monthly_rollups r join sums using (meter_id, month)
        where r.organization_id = $1
     ), up as (
       insert into monthly_rollups (organization_id, meter_id, month, energy_kwh, estimated_kwh, uncertainty_kwh, hours, estimated_hours)
       select $1, meter_id, month, energy_kwh, estimated_kwh, uncertainty_kwh, hours, estimated_hours from sums
       on conflict (organization_id, meter_id, month) do update set
         energy_kwh = excluded.energy_kwh, estimated_kwh = excluded.estimated_kwh,
         uncertainty_kwh = excluded.uncertainty_kwh,
         hours = excluded.hours, estimated_hours = excluded.estimated_hours, updated_at = now()
       returning meter_id, month, energy_kwh
     ), adj as (
       insert into ledger_adjustments (organization_id, meter_id, month, delta_kwh, source, reason, actor_user_id, gateway_id)
       select $1, up.meter_id, up.month, up.energy_kwh - coalesce(old.energy_kwh, 0), $5, $6, $7, $8
         from up
         join sums on sums.meter_id = up.meter_id and sums.month = up.month
         left join old on old.meter_id = up.meter_id and old.month = up.month
        where up.energy_kwh <> coalesce(old.energy_kwh, 0)
          and exists (select 1 from month_closes c
                       where c.organization_id = $1 and c.month = up.month and c.reopened_at is null
                         and (c.site_id is null or c.site_id = sums.site_id))
       returning 1
     )
     select count(*)::int as adjustments from adj`,
    [
      organizationId,
      meterId,
      from,
      to,
      change.source,
      change.reason,
      change.actorUserId ?? null,
      change.gatewayId ?? null,
    ],
  );
  return rows[0]?.adjustments ?? 0;
}

/** The same outside a caller's transaction (estimation after an ingest). */
export async function refreshRollupsNow(
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
  change: ChangeAttribution,
): Promise<void> {
  const client = await pool.connect();
  try {
    await refreshRollups(client, organizationId, meterId, from, to, change);
  } finally {
    client.release();
  }
}
