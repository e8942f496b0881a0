import { pool } from "~/db/client.server";
import { refreshRollups } from "~/ledger/refresh-rollups.server";

/**
 * A person's correction of one hour: the value becomes `edited`, keeps its
 * link to the raw readings, and the old value, new value and reason go to the
 * audit log in the same transaction as the month's rollup (and, for a closed
 * month, its adjusting entry).
 */
export async function editInterval(args: {
  organizationId: string;
  actorUserId: string;
  meterId: string;
  hourStart: Date;
  energyKwh: number;
  reason: string;
}): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query("begin");
    await client.query("select ensure_month_partitions($1, $1)", [
      args.hourStart,
    ]);
    const before = await client.query<{ energy_kwh: string; quality: string }>(
      `select energy_kwh::text, quality from intervals
        where organization_id = $1 and meter_id = $2 and hour_start = $3 for update`,
      [args.organizationId, args.meterId, args.hourStart],
    );
    const previous = before.rows[0] ?? null;
    await client.query(
      `insert into intervals (organization_id, meter_id, hour_start, energy_kwh, quality, flags)
       values ($1, $2, $3, $4, 'edited', '{}')
       on conflict (organization_id, meter_id, hour_start) do update set
         energy_kwh = excluded.energy_kwh, quality = 'edited', estimate_method = null, updated_at = now()`,
      [
        args.organizationId,
        args.meterId,
        args.hourStart,
        args.energyKwh.toFixed(6),
      ],
    );
    await client.query(
      `insert into audit_log (organization_id, actor_user_id, action, subject, details)
       values ($1, $2, 'interval.edited', $3, $4)`,
      [
        args.organizationId,
        args.actorUserId,
        `${args.meterId}@${args.hourStart.toISOString()}`,
        JSON.stringify({
          from: previous
            ? { energyKwh: previous.energy_kwh, quality: previous.quality }
            : null,
          to: { energyKwh: args.energyKwh.toFixed(6) },
          reason: args.reason,
        }),
      ],
    );
    await refreshRollups(
      client,
      args.organizationId,
      args.meterId,
      args.hourStart,
      new Date(args.hourStart.getTime() + 3_600_000),
      {
        source: "edit",
        reason: args.reason,
        actorUserId: args.actorUserId,
      },
    );
    await client.query("commit");
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}
