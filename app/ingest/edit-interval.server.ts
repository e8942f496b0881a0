import type { PoolClient } from "pg";
import { pool } from "~/db/client.server";
import {
  applyRollupDeltas,
  type RollupDelta,
} from "~/ledger/refresh-rollups.server";
import { ensurePartitions } from "./partitions.server";
import { correctionHourError, type InstalledPeriod } from "./time-rules";
import { writeIntervals } from "./write-intervals.server";

/** The hour becomes `edited` with the person's value, new or stored. */
function writeEdit(
  client: PoolClient,
  args: { organizationId: string; meterId: string; hourStart: Date },
  energyKwh: string,
): Promise<RollupDelta[]> {
  return writeIntervals(client, args.organizationId, {
    input: "select $2::uuid as m, $3::timestamptz as h, $4::numeric as k",
    params: [args.meterId, args.hourStart, energyKwh],
    insertColumns: "energy_kwh, quality, flags",
    insertValues: "u.k, 'edited', '{}'",
    update: "energy_kwh = u.k, quality = 'edited', estimate_method = null",
    from: args.hourStart,
    to: args.hourStart,
  });
}

export type EditOutcome = { ok: true } | { ok: false; reason: string };

/**
 * A person's correction of one hour: the value becomes `edited`, keeps its
 * link to the raw readings, and the old value, new value and reason go to the
 * audit log in the same transaction as the month's rollup (and, for a closed
 * month, its adjusting entry). An hour ingest would refuse (before the meter
 * was installed, after it was removed, in the future, before 1990, not on the
 * hour) is refused with the reason, and nothing is written.
 */
export async function editInterval(args: {
  organizationId: string;
  actorUserId: string;
  meter: InstalledPeriod & { id: string };
  hourStart: Date;
  energyKwh: number;
  reason: string;
  now?: Date;
}): Promise<EditOutcome> {
  const refused = correctionHourError(
    args.meter,
    args.hourStart,
    args.now ?? new Date(),
  );
  if (refused) return { ok: false, reason: refused };
  const client = await pool.connect();
  try {
    await client.query("begin");
    await ensurePartitions(client, args.hourStart, args.hourStart);
    const before = await client.query<{ energy_kwh: string; quality: string }>(
      `select energy_kwh::text, quality from intervals
        where organization_id = $1 and meter_id = $2 and hour_start = $3 for update`,
      [args.organizationId, args.meter.id, args.hourStart],
    );
    const previous = before.rows[0] ?? null;
    const energyKwh = args.energyKwh.toFixed(6);
    const hour = {
      organizationId: args.organizationId,
      meterId: args.meter.id,
      hourStart: args.hourStart,
    };
    const deltas = await writeEdit(client, hour, energyKwh);
    await client.query(
      `insert into audit_log (organization_id, actor_user_id, action, subject, details)
       values ($1, $2, 'interval.edited', $3, $4)`,
      [
        args.organizationId,
        args.actorUserId,
        `${args.meter.id}@${args.hourStart.toISOString()}`,
        JSON.stringify({
          from: previous
            ? { energyKwh: previous.energy_kwh, quality: previous.quality }
            : null,
          to: { energyKwh },
          reason: args.reason,
        }),
      ],
    );
    await applyRollupDeltas(client, args.organizationId, deltas, {
      source: "edit",
      reason: args.reason,
      actorUserId: args.actorUserId,
    });
    await client.query("commit");
    return { ok: true };
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}
