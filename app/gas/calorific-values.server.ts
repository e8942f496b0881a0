/**
 * A gas supply's calorific values: list, enter (one or a whole CSV at once),
 * remove one not yet used. Entering or changing a CV recomputes, in the same
 * transaction, every interval of its period whose energy took its CV from
 * the series (gas_interval_volumes); the rollups move by exactly the
 * difference, so in a closed month it becomes an adjusting entry
 * (applyRollupDeltas), never a silent change.
 */
import { and, asc, eq } from "drizzle-orm";
import type { PoolClient } from "pg";
import { recordAuditWith } from "~/audit/record-audit.server";
import { db, pool } from "~/db/client.server";
import { calorificValues, meters, sites } from "~/db/schema";
import { withTransaction } from "~/db/transaction.server";
import { writeIntervals } from "~/ingest/write-intervals.server";
import { applyRollupDeltas } from "~/ledger/refresh-rollups.server";
import {
  cvLookup,
  cvPeriodText,
  dayInPeriod,
  parseCvPeriod,
  type CalorificValueInput,
  type CvEntry,
  type CvPeriod,
  type CvPeriodKind,
} from "./calorific-values";
import { gasEnergyKwh, localDay } from "./gas-intervals";

// Raw SQL on one pg client, on purpose: the recomputation writes intervals
// and rollups with the readings path's own statements (writeIntervals,
// applyRollupDeltas), which take a pg client in a transaction.

export interface CvActor {
  actorUserId: string | null;
  actorTokenId?: string | null;
}

/** The meter a CV belongs to: one of the organisation's natural-gas meters. */
export interface GasSupplyMeter {
  id: string;
  code: string;
  siteId: string;
  timeZone: string;
  orientation: "import" | "export";
}

export class NotAGasSupplyError extends Error {}
export class CvInUseError extends Error {}

/** The meter, if it is here; NotAGasSupplyError if it is not a gas supply. */
export async function findGasSupply(
  organizationId: string,
  meterId: string,
): Promise<GasSupplyMeter | null> {
  const [row] = await db
    .select({
      id: meters.id,
      code: meters.code,
      siteId: meters.siteId,
      timeZone: sites.timeZone,
      orientation: meters.orientation,
      quantity: meters.quantity,
      carrier: meters.carrier,
    })
    .from(meters)
    .innerJoin(
      sites,
      and(
        eq(sites.organizationId, meters.organizationId),
        eq(sites.id, meters.siteId),
      ),
    )
    .where(
      and(eq(meters.organizationId, organizationId), eq(meters.id, meterId)),
    );
  if (!row) return null;
  if (row.quantity !== "gas_volume" || row.carrier !== "natural_gas")
    throw new NotAGasSupplyError(
      `Meter ${row.code} is not a natural-gas meter; calorific values belong to gas supplies.`,
    );
  return row;
}

export interface StoredCv {
  period: string;
  periodKind: CvPeriodKind;
  calorificValueMjM3: number;
  basis: "gross" | "net";
  source: string;
  updatedAt: Date;
}

/** The series, oldest first (a month before the days inside it). */
export async function listCalorificValues(
  organizationId: string,
  meterId: string,
): Promise<StoredCv[]> {
  const rows = await db
    .select()
    .from(calorificValues)
    .where(
      and(
        eq(calorificValues.organizationId, organizationId),
        eq(calorificValues.meterId, meterId),
      ),
    )
    .orderBy(asc(calorificValues.periodStart), asc(calorificValues.periodKind));
  return rows.map((r) => ({
    period: cvPeriodText({
      kind: r.periodKind as CvPeriodKind,
      start: r.periodStart,
    }),
    periodKind: r.periodKind as CvPeriodKind,
    calorificValueMjM3: Number(r.calorificValueMjM3),
    basis: r.basis as StoredCv["basis"],
    source: r.source,
    updatedAt: r.updatedAt,
  }));
}

async function seriesWith(
  client: PoolClient,
  organizationId: string,
  meterId: string,
): Promise<CvEntry[]> {
  const { rows } = await client.query<{
    period_kind: CvPeriodKind;
    period_start: string;
    cv: string;
    basis: "gross" | "net";
  }>(
    `select period_kind, to_char(period_start, 'YYYY-MM-DD') as period_start,
            calorific_value_mj_m3::text as cv, basis
       from calorific_values where organization_id = $1 and meter_id = $2`,
    [organizationId, meterId],
  );
  return rows.map((r) => ({
    kind: r.period_kind,
    start: r.period_start,
    cvMjM3: Number(r.cv),
    basis: r.basis,
  }));
}

interface VolumeRow {
  interval_start: Date;
  volume_m3: string;
  cv: string | null;
  energy_kwh: string;
}

/** The priced gas intervals whose site-local day lies in a period. */
async function volumesIn(
  client: PoolClient,
  organizationId: string,
  meter: GasSupplyMeter,
  period: CvPeriod,
): Promise<VolumeRow[]> {
  const length = period.kind === "month" ? "1 month" : "1 day";
  const { rows } = await client.query<VolumeRow>(
    `select interval_start, volume_m3::text, calorific_value_mj_m3::text as cv, energy_kwh::text
       from gas_interval_volumes
      where organization_id = $1 and meter_id = $2
        and interval_start >= ($3::date::timestamp at time zone $4)
        and interval_start < (($3::date + interval '${length}')::timestamp at time zone $4)
      order by interval_start`,
    [organizationId, meter.id, period.start, meter.timeZone],
  );
  return rows;
}

/** Integer micro-kWh of a 6-decimal kWh text: exact differences. */
const micro = (kwh: string | number) =>
  Math.round(Number(typeof kwh === "number" ? kwh.toFixed(6) : kwh) * 1e6);
const fromMicro = (n: number) => (n / 1e6).toFixed(6);

/**
 * Reprices the period's intervals at the series as it now stands; returns
 * how many intervals changed. Edited intervals keep the person's energy
 * (their volume row still takes the new CV, as a later reading would).
 */
async function repriceIntervals(
  client: PoolClient,
  organizationId: string,
  meter: GasSupplyMeter,
  periods: CvPeriod[],
  reason: string,
  actor: CvActor,
): Promise<number> {
  const lookup = cvLookup(await seriesWith(client, organizationId, meter.id));
  const sign = meter.orientation === "export" ? -1 : 1;
  const changed: {
    start: Date;
    cv: number | null;
    energy: string;
    delta: string;
  }[] = [];
  const seen = new Set<number>();
  for (const period of periods) {
    for (const row of await volumesIn(client, organizationId, meter, period)) {
      const t = row.interval_start.getTime();
      if (seen.has(t)) continue;
      seen.add(t);
      const cv = lookup(localDay(row.interval_start, meter.timeZone));
      const newCv = cv?.cvMjM3 ?? null;
      if (newCv === (row.cv === null ? null : Number(row.cv))) continue;
      const energy =
        newCv === null ? 0 : sign * gasEnergyKwh(Number(row.volume_m3), newCv);
      const delta = micro(energy) - micro(row.energy_kwh);
      changed.push({
        start: row.interval_start,
        cv: newCv,
        energy: fromMicro(micro(energy)),
        delta: fromMicro(delta),
      });
    }
  }
  if (changed.length === 0) return 0;
  changed.sort((a, b) => a.start.getTime() - b.start.getTime());
  const deltas = await writeIntervals(client, organizationId, {
    input: `select $2::uuid as m, h, k from unnest($3::timestamptz[], $4::numeric[]) as p(h, k)`,
    params: [
      meter.id,
      changed.map((c) => c.start.toISOString()),
      changed.map((c) => c.delta),
    ],
    // The intervals exist (their volumes were written with them); an
    // interval removed since would come back with only the CV's change.
    insertColumns: "energy_kwh, quality",
    insertValues: "u.k, 'measured'",
    update: `energy_kwh = case when i.quality = 'edited' then i.energy_kwh else i.energy_kwh + u.k end,
       flags = case when u.k <> 0 or i.quality = 'edited' then array_remove(i.flags, 'cv_pending') else i.flags end`,
    from: changed[0].start,
    to: changed[changed.length - 1].start,
  });
  await client.query(
    `update gas_interval_volumes g set calorific_value_mj_m3 = u.cv, energy_kwh = u.k
       from unnest($3::timestamptz[], $4::numeric[], $5::numeric[]) as u(h, cv, k)
      where g.organization_id = $1 and g.meter_id = $2 and g.interval_start = u.h`,
    [
      organizationId,
      meter.id,
      changed.map((c) => c.start.toISOString()),
      changed.map((c) => (c.cv === null ? null : String(c.cv))),
      changed.map((c) => c.energy),
    ],
  );
  await applyRollupDeltas(client, organizationId, deltas, {
    source: "calorific_value",
    reason,
    actorUserId: actor.actorUserId,
    actorTokenId: actor.actorTokenId ?? null,
  });
  return changed.length;
}

const lockMeter = (client: PoolClient, meterId: string) =>
  // The same lock the readings path takes for a priced gas meter
  // (register-hours.server.ts), so a batch and a CV change take turns.
  client.query("select pg_advisory_xact_lock(hashtext($1))", [meterId]);

export interface SaveOutcome {
  saved: number;
  /** Intervals whose energy changed with the new CVs. */
  intervalsRepriced: number;
}

type StoredRow = { cv: string; basis: string; source: string };

/**
 * Enters CVs (new periods, or new values for periods already entered), all
 * or none, and reprices the intervals of their periods.
 */
export async function saveCalorificValues(args: {
  organizationId: string;
  meter: GasSupplyMeter;
  entries: CalorificValueInput[];
  actor: CvActor;
}): Promise<SaveOutcome> {
  const { organizationId, meter, actor } = args;
  return withTransaction(pool, async (client) => {
    await lockMeter(client, meter.id);
    const periods: CvPeriod[] = [];
    const words: string[] = [];
    for (const entry of args.entries) {
      const period = parseCvPeriod(entry.period)!;
      const { rows: before } = await client.query<StoredRow>(
        `select calorific_value_mj_m3::text as cv, basis, source from calorific_values
          where organization_id = $1 and meter_id = $2 and period_kind = $3 and period_start = $4
          for update`,
        [organizationId, meter.id, period.kind, period.start],
      );
      await client.query(
        `insert into calorific_values (organization_id, meter_id, period_kind, period_start,
                                       calorific_value_mj_m3, basis, source, entered_by_user_id)
         values ($1, $2, $3, $4, $5, $6, $7, $8)
         on conflict (organization_id, meter_id, period_kind, period_start) do update set
           calorific_value_mj_m3 = excluded.calorific_value_mj_m3, basis = excluded.basis,
           source = excluded.source, entered_by_user_id = excluded.entered_by_user_id,
           updated_at = now()`,
        [
          organizationId,
          meter.id,
          period.kind,
          period.start,
          entry.calorific_value_mj_m3,
          entry.basis,
          entry.source ?? "",
          actor.actorUserId,
        ],
      );
      const was = before[0];
      const after = {
        calorificValueMjM3: String(entry.calorific_value_mj_m3),
        basis: entry.basis,
      };
      const unchanged =
        was &&
        Number(was.cv) === entry.calorific_value_mj_m3 &&
        was.basis === entry.basis;
      if (unchanged && was.source === (entry.source ?? "")) continue;
      await recordAuditWith(client, {
        organizationId,
        actorUserId: actor.actorUserId,
        actorTokenId: actor.actorTokenId ?? null,
        action: "gas.cv_saved",
        subject: meter.id,
        siteId: meter.siteId,
        meterId: meter.id,
        before: was
          ? { calorificValueMjM3: String(Number(was.cv)), basis: was.basis }
          : null,
        after,
        details: { period: cvPeriodText(period), source: entry.source ?? "" },
      });
      periods.push(period);
      words.push(
        `${cvPeriodText(period)}: ${entry.calorific_value_mj_m3} MJ/m³ ${entry.basis}`,
      );
    }
    const intervalsRepriced = periods.length
      ? await repriceIntervals(
          client,
          organizationId,
          meter,
          periods,
          `calorific value of meter ${meter.code} entered (${words.slice(0, 3).join("; ")}${words.length > 3 ? "; …" : ""})`,
          actor,
        )
      : 0;
    return { saved: args.entries.length, intervalsRepriced };
  });
}

/**
 * Removes a CV that no interval's energy has used yet; one in use is
 * refused (CvInUseError): change its value instead, which is recorded.
 * Returns false when there is no such entry.
 */
export async function deleteCalorificValue(args: {
  organizationId: string;
  meter: GasSupplyMeter;
  period: CvPeriod;
  actor: CvActor;
}): Promise<boolean> {
  const { organizationId, meter, period, actor } = args;
  return withTransaction(pool, async (client) => {
    await lockMeter(client, meter.id);
    const series = await seriesWith(client, organizationId, meter.id);
    const entry = series.find(
      (e) => e.kind === period.kind && e.start === period.start,
    );
    if (!entry) return false;
    const lookup = cvLookup(series);
    const used = (await volumesIn(client, organizationId, meter, period)).some(
      (row) => {
        const day = localDay(row.interval_start, meter.timeZone);
        return dayInPeriod(day, period) && lookup(day) === entry;
      },
    );
    if (used)
      throw new CvInUseError(
        `The calorific value for ${cvPeriodText(period)} has priced readings already; enter a corrected value instead.`,
      );
    await client.query(
      `delete from calorific_values
        where organization_id = $1 and meter_id = $2 and period_kind = $3 and period_start = $4`,
      [organizationId, meter.id, period.kind, period.start],
    );
    await recordAuditWith(client, {
      organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "gas.cv_deleted",
      subject: meter.id,
      siteId: meter.siteId,
      meterId: meter.id,
      before: { calorificValueMjM3: String(entry.cvMjM3), basis: entry.basis },
      after: null,
      details: { period: cvPeriodText(period) },
    });
    return true;
  });
}
