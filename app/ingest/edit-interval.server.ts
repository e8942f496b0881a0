import type { PoolClient } from "pg";
import { recordAuditWith } from "~/audit/record-audit.server";
import { pool } from "~/db/client.server";
import { withTransaction } from "~/db/transaction.server";
import { recomputeMeters, runnerOf } from "~/exergy/exergy-store.server";
import {
  applyRollupDeltas,
  type RollupDelta,
} from "~/ledger/refresh-rollups.server";
import {
  CONFIRMED_SPIKE_FLAG,
  jumpMessage,
  spikeJump,
  VALUE_FLAGS,
  wrongSignError,
  type CorrectedMeter,
  type Jump,
} from "./correction-rules";
import { loadSeries, windowFor } from "./estimate-meter.server";
import { ensurePartitions } from "./partitions.server";
import { correctionIntervalError, type InstalledPeriod } from "./time-rules";
import { writeIntervals } from "./write-intervals.server";

/**
 * The hour becomes `edited` with the person's value, new or stored. Flags
 * about the old value (a spike, a wrong sign) go with it; `flags` are the
 * ones the new value carries.
 */
function writeEdit(
  client: PoolClient,
  args: { organizationId: string; meterId: string; intervalStart: Date },
  energyKwh: string,
  flags: string[],
): Promise<RollupDelta[]> {
  return writeIntervals(client, args.organizationId, {
    // vf: the value flags to drop; in the input, as the claim also sees $6.
    input: `select $2::uuid as m, $3::timestamptz as h, $4::numeric as k,
                   $5::text[] as f, $6::text[] as vf`,
    params: [args.meterId, args.intervalStart, energyKwh, flags, VALUE_FLAGS],
    insertColumns: "energy_kwh, quality, flags",
    insertValues: "u.k, 'edited', u.f",
    update: `energy_kwh = u.k, quality = 'edited', estimate_method = null,
      flags = array(select flag from unnest(i.flags) as flag where flag <> all(u.vf)) || u.f`,
    from: args.intervalStart,
    to: args.intervalStart,
  });
}

/** The meter's intervals around `intervalStart`, as ingest's spike check sees them. */
async function historyAround(
  client: PoolClient,
  organizationId: string,
  meterId: string,
  intervalStart: Date,
) {
  const { start, end } = await windowFor(
    organizationId,
    meterId,
    intervalStart,
    intervalStart,
    client,
  );
  return loadSeries(organizationId, meterId, start, end, client);
}

export type EditOutcome =
  | { ok: true; flags: string[] }
  | {
      ok: false;
      /** The form field the reason belongs beside. */
      field: "intervalStart" | "energyKwh";
      reason: string;
      /** Set when the value may be saved once the person confirms the jump. */
      jump?: Jump;
    };

/**
 * A person's correction of one interval (at the meter's resolution): the
 * value becomes `edited`, keeps its
 * link to the raw readings, and the old value, new value and reason go to the
 * audit log in the same transaction as the month's rollup (and, for a closed
 * month, its adjusting entry). Refused, with nothing written:
 *  - an hour ingest would refuse (before the meter was installed, after it
 *    was removed, in the future, before 1990, not on the hour);
 *  - a value of the wrong sign for the meter (an import meter's hours are
 *    never negative: correction-rules.ts);
 *  - a value ingest would flag as a spike against the meter's own history,
 *    unless `confirmedSpike`: then it is stored flagged `confirmed_spike`
 *    and the audit entry records the jump and the confirmation.
 */
export async function editInterval(args: {
  organizationId: string;
  actorUserId: string;
  meter: InstalledPeriod &
    CorrectedMeter & { id: string; intervalMinutes: number };
  intervalStart: Date;
  energyKwh: number;
  reason: string;
  /** The person confirmed this very value after being shown its jump. */
  confirmedSpike?: boolean;
  now?: Date;
}): Promise<EditOutcome> {
  const refused = correctionIntervalError(
    args.meter,
    args.intervalStart,
    args.now ?? new Date(),
  );
  if (refused) return { ok: false, field: "intervalStart", reason: refused };
  const wrongSign = wrongSignError(args.meter, args.energyKwh);
  if (wrongSign) return { ok: false, field: "energyKwh", reason: wrongSign };
  // Raw SQL on a pg client: the interval and rollup writes ingest shares,
  // which `npm run bench readings` chose over the query builder.
  return withTransaction(pool, async (client) => {
    const history = await historyAround(
      client,
      args.organizationId,
      args.meter.id,
      args.intervalStart,
    );
    const jump = spikeJump(
      args.meter,
      args.energyKwh,
      history,
      args.intervalStart,
    );
    // Nothing written yet: returning commits an empty transaction.
    if (jump && !args.confirmedSpike)
      return {
        ok: false,
        field: "energyKwh",
        reason: jumpMessage(args.energyKwh, jump),
        jump,
      };
    const flags = jump ? [CONFIRMED_SPIKE_FLAG] : [];
    await ensurePartitions(client, args.intervalStart, args.intervalStart);
    const before = await client.query<{ energy_kwh: string; quality: string }>(
      `select energy_kwh::text, quality from intervals
        where organization_id = $1 and meter_id = $2 and interval_start = $3 for update`,
      [args.organizationId, args.meter.id, args.intervalStart],
    );
    const previous = before.rows[0] ?? null;
    const energyKwh = args.energyKwh.toFixed(6);
    const hour = {
      organizationId: args.organizationId,
      meterId: args.meter.id,
      intervalStart: args.intervalStart,
    };
    const deltas = await writeEdit(client, hour, energyKwh, flags);
    await recordAuditWith(client, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "interval.edited",
      subject: `${args.meter.id}@${args.intervalStart.toISOString()}`,
      details: {
        from: previous
          ? { energyKwh: previous.energy_kwh, quality: previous.quality }
          : null,
        to: { energyKwh },
        reason: args.reason,
        ...(jump ? { confirmedSpike: auditedJump(jump) } : {}),
      },
    });
    await applyRollupDeltas(client, args.organizationId, deltas, {
      source: "edit",
      reason: args.reason,
      actorUserId: args.actorUserId,
    });
    // An edited interval has no exergy: the readings' is no longer its own.
    await recomputeMeters(runnerOf(client), args.organizationId, {
      meterIds: [args.meter.id],
      from: args.intervalStart,
      to: args.intervalStart,
    });
    return { ok: true, flags };
  });
}

/** The jump as the audit log keeps it: decimal text, as kWh are stored. */
function auditedJump(jump: Jump) {
  return {
    confirmed: true,
    typicalIntervalKwh: jump.typicalIntervalKwh.toFixed(6),
    timesTypical: Number(jump.timesTypical.toFixed(1)),
    spikeFactor: jump.spikeFactor,
  };
}
