import type { PoolClient } from "pg";

// Raw SQL, on purpose: the rollup deltas every batch applies, measured by `npm run bench readings`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

/** Who or what changed the intervals: recorded on any adjusting entry. */
export interface ChangeAttribution {
  /** calorific_value: a gas supply's CV entered or changed (app/gas). */
  source: "late_data" | "edit" | "estimate" | "calorific_value";
  reason: string;
  actorUserId?: string | null;
  gatewayId?: string | null;
  /** The organisation API token that posted the readings, named in the audit entry. */
  actorTokenId?: string | null;
}

/**
 * What a set of interval changes adds to one meter's rollup for one
 * site-local month. Sums are PostgreSQL numeric carried as text, so nothing
 * is rounded on the way through JavaScript.
 */
export interface RollupDelta {
  meter_id: string;
  /** The first day of the site-local month, YYYY-MM-DD. */
  month: string;
  energy_kwh: string;
  estimated_kwh: string;
  uncertainty_kwh: string;
  hours: number;
  estimated_hours: number;
}

/**
 * Adds interval changes to the monthly rollups, in the caller's transaction.
 *
 * Each change is the exact difference (new − old) of hours the caller has
 * written and still holds locked, so adding it keeps every rollup equal to
 * the sum of its hours however batches interleave: the addition is applied
 * to the row's latest version after any concurrent writer commits, where a
 * recomputation would sum a snapshot that misses that writer's hours. Rows
 * are taken in key order so two transactions never wait on each other in a
 * cycle. When a month is closed, a change in its energy is written as an
 * adjusting entry in the same statement, so it can never be silent, and
 * recorded in the audit trail with the meter's month before and after it.
 */
export async function applyRollupDeltas(
  client: PoolClient,
  organizationId: string,
  deltas: readonly RollupDelta[],
  change: ChangeAttribution,
): Promise<number> {
  if (deltas.length === 0) return 0;
  const { rows } = await client.query<{ adjustments: number }>({
    // Prepared once per connection: it runs for every batch.
    name: "ledger_apply_rollup_deltas",
    text: `with d as (
       select m as meter_id, mo as month, sum(e) as e, sum(ee) as ee, sum(x) as x,
              sum(n)::int as n, sum(ne)::int as ne
         from unnest($2::uuid[], $3::date[], $4::numeric[], $5::numeric[], $6::numeric[], $7::int[], $8::int[])
           as u(m, mo, e, ee, x, n, ne)
        group by m, mo
       having sum(e) <> 0 or sum(ee) <> 0 or sum(x) <> 0 or sum(n) <> 0 or sum(ne) <> 0
     ), up as (
       insert into monthly_rollups as r (organization_id, meter_id, month, energy_kwh, estimated_kwh, uncertainty_kwh, hours, estimated_hours)
       select $1, meter_id, month, e, ee, x, n, ne from d order by meter_id, month
       on conflict (organization_id, meter_id, month) do update set
         energy_kwh = r.energy_kwh + excluded.energy_kwh,
         estimated_kwh = r.estimated_kwh + excluded.estimated_kwh,
         uncertainty_kwh = r.uncertainty_kwh + excluded.uncertainty_kwh,
         hours = r.hours + excluded.hours,
         estimated_hours = r.estimated_hours + excluded.estimated_hours,
         updated_at = now()
       returning meter_id, month, energy_kwh
     ), adj as (
       insert into ledger_adjustments (organization_id, meter_id, month, delta_kwh, source, reason, actor_user_id, gateway_id)
       select $1, d.meter_id, d.month, d.e, $9, $10, $11, $12
         from d join meters m on m.organization_id = $1 and m.id = d.meter_id
        where d.e <> 0
          and exists (select 1 from month_closes c
                       where c.organization_id = $1 and c.month = d.month and c.reopened_at is null
                         and (c.site_id is null or c.site_id = m.site_id))
       returning id, meter_id, month, delta_kwh
     ), audited as (
       insert into audit_log (organization_id, actor_user_id, actor_gateway_id, actor_token_id, action,
                              subject, site_id, meter_id, reason, before, after, details)
       select $1, $11, $12, $13::uuid, 'ledger.adjusted', a.id::text, m.site_id, a.meter_id, $10,
              jsonb_build_object('energyKwh', (u.energy_kwh - a.delta_kwh)::text),
              jsonb_build_object('energyKwh', u.energy_kwh::text),
              jsonb_build_object('month', to_char(a.month, 'YYYY-MM'), 'deltaKwh', a.delta_kwh::text,
                                 'source', $9::text, 'adjustmentId', a.id)
         from adj a
         join up u on u.meter_id = a.meter_id and u.month = a.month
         join meters m on m.organization_id = $1 and m.id = a.meter_id
       returning 1
     )
     select (select count(*) from adj)::int as adjustments, (select count(*) from up)::int as rollups`,
    values: [
      organizationId,
      deltas.map((d) => d.meter_id),
      deltas.map((d) => d.month),
      deltas.map((d) => d.energy_kwh),
      deltas.map((d) => d.estimated_kwh),
      deltas.map((d) => d.uncertainty_kwh),
      deltas.map((d) => d.hours),
      deltas.map((d) => d.estimated_hours),
      change.source,
      change.reason,
      change.actorUserId ?? null,
      change.gatewayId ?? null,
      change.actorTokenId ?? null,
    ],
  });
  return rows[0]?.adjustments ?? 0;
}
