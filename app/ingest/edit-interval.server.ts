import { db } from "~/db/client.server";
import { recordAudit } from "~/audit/record-audit.server";
import { sql } from "drizzle-orm";

/**
 * A person's correction of one hour: the value becomes `edited`, keeps its
 * link to the raw readings, and the old value, new value and reason go to the
 * audit log in the same transaction.
 */
export async function editInterval(args: {
  organizationId: string;
  actorUserId: string;
  meterId: string;
  hourStart: Date;
  energyKwh: number;
  reason: string;
}): Promise<boolean> {
  return db.transaction(async (tx) => {
    await tx.execute(
      sql`select ensure_month_partitions(${args.hourStart}, ${args.hourStart})`,
    );
    const before = await tx.execute<{ energy_kwh: string; quality: string }>(
      sql`select energy_kwh::text, quality from intervals
           where organization_id = ${args.organizationId} and meter_id = ${args.meterId} and hour_start = ${args.hourStart}
           for update`,
    );
    const previous = before.rows[0] ?? null;
    await tx.execute(sql`
      insert into intervals (organization_id, meter_id, hour_start, energy_kwh, quality, flags)
      values (${args.organizationId}, ${args.meterId}, ${args.hourStart}, ${args.energyKwh.toFixed(6)}, 'edited', '{}')
      on conflict (organization_id, meter_id, hour_start) do update set
        energy_kwh = excluded.energy_kwh, quality = 'edited', estimate_method = null, updated_at = now()`);
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "interval.edited",
      subject: `${args.meterId}@${args.hourStart.toISOString()}`,
      details: {
        from: previous
          ? { energyKwh: previous.energy_kwh, quality: previous.quality }
          : null,
        to: { energyKwh: args.energyKwh.toFixed(6) },
        reason: args.reason,
      },
    });
    return true;
  });
}
