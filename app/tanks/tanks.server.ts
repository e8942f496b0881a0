/**
 * Tanks: a liquid-fuel meter's settings, dips and deliveries, and the write
 * path that turns them into the meter's intervals (docs/fuels-tanks.md).
 *
 * Each entry is stored in one transaction with everything it changes: the
 * intervals between the dips around it (replaced, never added), the monthly
 * rollups by their exact difference, an adjusting entry for a closed month
 * (applyRollupDeltas, as for late readings) and the audit entry. An entry
 * that would make a consumption negative, or that lies outside the tank's
 * range, is refused before anything is written.
 */
import type { PoolClient } from "pg";
import { recordAuditWith } from "~/audit/record-audit.server";
import { pool } from "~/db/client.server";
import { isUniqueViolation } from "~/db/errors.server";
import { withTransaction } from "~/db/transaction.server";
import { floorToStep, stepMsOf } from "~/ingest/hours";
import { ensurePartitions } from "~/ingest/partitions.server";
import { writeIntervals } from "~/ingest/write-intervals.server";
import {
  applyRollupDeltas,
  type RollupDelta,
} from "~/ledger/refresh-rollups.server";
import type { Orientation, Quantity } from "~/sites/meter-kinds";
import {
  dipPeriods,
  intervalEnergies,
  TankBalanceError,
  type DipPeriod,
  type FuelProperties,
  type TankDelivery,
  type TankDip,
} from "./tank-balance";
import type {
  TankDeliveryBody,
  TankDipBody,
  TankSettingsBody,
} from "./tank-schema";

// Raw SQL on a pg client: the interval and rollup writes are ingest's
// (writeIntervals, applyRollupDeltas), which `npm run bench readings` chose
// over the query builder, and the reads must see the same transaction.

/** The estimate_method of an interval that holds a share of a dip-to-dip total. */
export const TANK_SPREAD = "tank_spread";

/** A refusal: the HTTP status it answers, a code, and the fields it names. */
export class TankRuleError extends Error {
  constructor(
    readonly status: 400 | 404 | 409,
    readonly code: string,
    message: string,
    readonly fields: readonly string[] = [],
  ) {
    super(message);
    this.name = "TankRuleError";
  }
}

export interface TankMeter {
  id: string;
  siteId: string;
  quantity: Quantity;
  orientation: Orientation;
  intervalMinutes: number;
  installedAt: Date;
  removedAt: Date | null;
}

export interface Tank extends FuelProperties {
  meterId: string;
  capacityL: string;
  cvBasis: "gross" | "net";
}

export interface StoredDelivery extends TankDelivery {
  id: string;
  note: string;
}

export interface StoredDip extends TankDip {
  note: string;
}

export interface TankActor {
  actorUserId: string | null;
  actorTokenId?: string | null;
}

type Db = Pick<PoolClient, "query">;

async function readTank(
  db: Db,
  organizationId: string,
  meterId: string,
  forUpdate = false,
): Promise<Tank | null> {
  const { rows } = await db.query<{
    capacity_l: string;
    density_kg_l: string;
    calorific_value_mj_kg: string;
    cv_basis: "gross" | "net";
  }>(
    `select capacity_l::text, density_kg_l::text, calorific_value_mj_kg::text, cv_basis
       from tanks where organization_id = $1 and meter_id = $2${forUpdate ? " for update" : ""}`,
    [organizationId, meterId],
  );
  const row = rows[0];
  if (!row) return null;
  return {
    meterId,
    capacityL: row.capacity_l,
    densityKgL: row.density_kg_l,
    calorificValueMjKg: row.calorific_value_mj_kg,
    cvBasis: row.cv_basis,
  };
}

export function getTank(organizationId: string, meterId: string) {
  return readTank(pool, organizationId, meterId);
}

async function readEntries(db: Db, organizationId: string, meterId: string) {
  const dips = await db.query<{
    dipped_at: Date;
    stock_l: string;
    note: string;
  }>(
    `select dipped_at, stock_l::text, note from tank_dips
      where organization_id = $1 and meter_id = $2 order by dipped_at`,
    [organizationId, meterId],
  );
  const deliveries = await db.query<{
    id: string;
    delivered_at: Date;
    volume_l: string;
    density_kg_l: string | null;
    calorific_value_mj_kg: string | null;
    note: string;
  }>(
    `select id, delivered_at, volume_l::text, density_kg_l::text, calorific_value_mj_kg::text, note
       from tank_deliveries where organization_id = $1 and meter_id = $2
      order by delivered_at, created_at`,
    [organizationId, meterId],
  );
  return {
    dips: dips.rows.map((r): StoredDip => ({
      time: r.dipped_at,
      stockL: r.stock_l,
      note: r.note,
    })),
    deliveries: deliveries.rows.map((r): StoredDelivery => ({
      id: r.id,
      time: r.delivered_at,
      volumeL: r.volume_l,
      densityKgL: r.density_kg_l,
      calorificValueMjKg: r.calorific_value_mj_kg,
      note: r.note,
    })),
  };
}

export function listTankEntries(organizationId: string, meterId: string) {
  return readEntries(pool, organizationId, meterId);
}

/** The periods between consecutive dips (stored entries never give a negative one). */
export function tankPeriods(
  tank: Tank,
  entries: { dips: readonly TankDip[]; deliveries: readonly TankDelivery[] },
): DipPeriod[] {
  return dipPeriods(entries.dips, entries.deliveries, tank);
}

// ------------------------------------------------------------ checks --

const MAX_FUTURE_MS = 5 * 60_000;

/** A dip or delivery happened while the meter was installed, and not in the future. */
function requireTimeInService(meter: TankMeter, time: Date, now: Date) {
  const range =
    `${meter.installedAt.toISOString()} (installed) to ` +
    (meter.removedAt ? `${meter.removedAt.toISOString()} (removed)` : "now");
  const late = meter.removedAt ?? new Date(now.getTime() + MAX_FUTURE_MS);
  if (time < meter.installedAt || time > late) {
    throw new TankRuleError(
      400,
      "invalid_body",
      `time: ${time.toISOString()} is outside ${range}`,
      ["time"],
    );
  }
}

function requireWithinCapacity(field: string, litres: number, tank: Tank) {
  const capacity = Number(tank.capacityL);
  if (litres > capacity) {
    throw new TankRuleError(
      400,
      "invalid_body",
      `${field}: ${litres} l is outside 0 l to ${capacity} l (the tank's capacity_l)`,
      [field],
    );
  }
}

/** The balance of every period after the change; a negative one refuses the change. */
function balancedPeriods(
  tank: Tank,
  dips: readonly TankDip[],
  deliveries: readonly TankDelivery[],
): DipPeriod[] {
  try {
    return dipPeriods(dips, deliveries, tank);
  } catch (e) {
    if (e instanceof TankBalanceError) {
      throw new TankRuleError(400, "negative_consumption", e.message, e.fields);
    }
    throw e;
  }
}

// ------------------------------------------------------- the intervals --

/**
 * Rewrites the meter's intervals whose start lies in [floor(from), to): each
 * holds its share of the periods that overlap it, estimated (the split is
 * ours; the dip-to-dip total is measured). A person's edit stands, flagged
 * that data came after it, as with register reads.
 */
async function writeTankIntervals(
  client: PoolClient,
  organizationId: string,
  meter: TankMeter,
  periods: readonly DipPeriod[],
  from: Date,
  to: Date,
): Promise<RollupDelta[]> {
  const stepMs = stepMsOf(meter);
  const lo = floorToStep(from, stepMs).getTime();
  const shares = intervalEnergies(periods, stepMs).filter(
    (s) =>
      s.intervalStart.getTime() >= lo &&
      s.intervalStart.getTime() < to.getTime(),
  );
  if (shares.length === 0) return [];
  // Fuel is bought, so a tank meter imports; an export one would be negative.
  const signed = (kwh: string) =>
    meter.orientation === "export" && kwh !== "0.000000" ? `-${kwh}` : kwh;
  const first = shares[0].intervalStart;
  const last = shares[shares.length - 1].intervalStart;
  await ensurePartitions(client, first, last);
  return writeIntervals(client, organizationId, {
    input: `select $2::uuid as m, h, k, 'estimated'::interval_quality as q, $5::text as em
              from unnest($3::timestamptz[], $4::numeric[]) as p(h, k)`,
    params: [
      meter.id,
      shares.map((s) => s.intervalStart.toISOString()),
      shares.map((s) => signed(s.energyKwh)),
      TANK_SPREAD,
    ],
    insertColumns: "energy_kwh, quality, estimate_method",
    insertValues: "u.k, u.q, u.em",
    update: `energy_kwh = case when i.quality = 'edited' then i.energy_kwh else u.k end,
       quality = case when i.quality = 'edited' then i.quality else u.q end,
       flags = case when i.quality = 'edited'
         then array(select distinct unnest(i.flags || '{late_data_after_edit}'))
         else '{}'::text[] end,
       estimate_method = case when i.quality = 'edited' then i.estimate_method else u.em end`,
    from: first,
    to: last,
  });
}

/** Two entries for one tank at once would each balance without the other. */
async function lockTank(client: PoolClient, meterId: string) {
  await client.query("select pg_advisory_xact_lock(hashtext($1))", [
    `tank:${meterId}`,
  ]);
}

async function lockedTank(
  client: PoolClient,
  organizationId: string,
  meter: TankMeter,
): Promise<Tank> {
  await lockTank(client, meter.id);
  const tank = await readTank(client, organizationId, meter.id, true);
  if (!tank) throw notATank();
  return tank;
}

export function notATank() {
  return new TankRuleError(
    404,
    "not_a_tank",
    "This meter is not a tank: give it a capacity first (PUT …/tank).",
  );
}

/** The periods inside the span a change rewrote (not those that only touch it). */
const overlapping = (periods: readonly DipPeriod[], from: Date, to: Date) =>
  periods.filter((p) => p.to > from && p.from < to);

export interface EntryOutcome {
  periods: DipPeriod[];
  adjustments: number;
}

async function applyChange(
  client: PoolClient,
  organizationId: string,
  meter: TankMeter,
  periods: DipPeriod[],
  span: { from: Date; to: Date },
  change: { reason: string } & TankActor,
): Promise<EntryOutcome> {
  const deltas = await writeTankIntervals(
    client,
    organizationId,
    meter,
    periods,
    span.from,
    span.to,
  );
  const adjustments = await applyRollupDeltas(client, organizationId, deltas, {
    source: "late_data",
    reason: change.reason,
    actorUserId: change.actorUserId,
    actorTokenId: change.actorTokenId ?? null,
  });
  return { periods: overlapping(periods, span.from, span.to), adjustments };
}

// ------------------------------------------------------------- writes --

/** Makes a liquid-fuel meter a tank, or changes its settings. */
export async function saveTank(args: {
  organizationId: string;
  meter: TankMeter;
  body: TankSettingsBody;
  actor: TankActor;
}): Promise<EntryOutcome> {
  const { organizationId, meter, body } = args;
  if (meter.quantity !== "liquid_fuel") {
    throw new TankRuleError(
      409,
      "not_liquid_fuel",
      `Only a liquid_fuel meter can be a tank; this one measures ${meter.quantity}.`,
    );
  }
  return withTransaction(pool, async (client) => {
    await lockTank(client, meter.id);
    const before = await readTank(client, organizationId, meter.id, true);
    const entries = await readEntries(client, organizationId, meter.id);
    const highest = Math.max(0, ...entries.dips.map((x) => Number(x.stockL)));
    if (body.capacity_l < highest) {
      throw new TankRuleError(
        400,
        "invalid_body",
        `capacity_l: ${body.capacity_l} l is below the highest dip stored, ${highest} l`,
        ["capacity_l"],
      );
    }
    const values = [
      String(body.capacity_l),
      String(body.density_kg_l),
      String(body.calorific_value_mj_kg),
      body.cv_basis ?? "gross",
    ];
    await client.query(
      `insert into tanks (organization_id, meter_id, capacity_l, density_kg_l, calorific_value_mj_kg, cv_basis)
       values ($1, $2, $3, $4, $5, $6)
       on conflict (organization_id, meter_id) do update set capacity_l = excluded.capacity_l,
         density_kg_l = excluded.density_kg_l, calorific_value_mj_kg = excluded.calorific_value_mj_kg,
         cv_basis = excluded.cv_basis, updated_at = now()`,
      [organizationId, meter.id, ...values],
    );
    const tank = (await readTank(client, organizationId, meter.id))!;
    await recordAuditWith(client, {
      organizationId,
      ...args.actor,
      action: "tank.saved",
      subject: meter.id,
      siteId: meter.siteId,
      meterId: meter.id,
      before: before && tankAudit(before),
      after: tankAudit(tank),
    });
    // The declared fuel prices every period without a delivery note.
    const periods = dipPeriods(entries.dips, entries.deliveries, tank);
    if (periods.length === 0) return { periods: [], adjustments: 0 };
    return applyChange(
      client,
      organizationId,
      meter,
      periods,
      { from: periods[0].from, to: periods[periods.length - 1].to },
      { reason: "Tank's declared fuel changed", ...args.actor },
    );
  });
}

const tankAudit = (tank: Tank) => ({
  capacityL: tank.capacityL,
  densityKgL: tank.densityKgL,
  calorificValueMjKg: tank.calorificValueMjKg,
  cvBasis: tank.cvBasis,
});

/** A dip: the periods on either side of it change. */
export async function addTankDip(args: {
  organizationId: string;
  meter: TankMeter;
  body: TankDipBody;
  actor: TankActor;
  now?: Date;
}): Promise<EntryOutcome> {
  const { organizationId, meter, body } = args;
  const time = new Date(body.time);
  requireTimeInService(meter, time, args.now ?? new Date());
  return withTransaction(pool, async (client) => {
    const tank = await lockedTank(client, organizationId, meter);
    requireWithinCapacity("stock_l", body.stock_l, tank);
    const entries = await readEntries(client, organizationId, meter.id);
    if (entries.dips.some((x) => x.time.getTime() === time.getTime())) {
      throw new TankRuleError(
        409,
        "dip_exists",
        `time: the tank already has a dip at ${time.toISOString()}`,
        ["time"],
      );
    }
    const dip = { time, stockL: String(body.stock_l) };
    const periods = balancedPeriods(
      tank,
      [...entries.dips, dip],
      entries.deliveries,
    );
    await client
      .query(
        `insert into tank_dips (organization_id, meter_id, dipped_at, stock_l, note) values ($1, $2, $3, $4, $5)`,
        [organizationId, meter.id, time, dip.stockL, body.note ?? ""],
      )
      .catch((e: unknown) => {
        if (isUniqueViolation(e))
          throw new TankRuleError(
            409,
            "dip_exists",
            "time: a dip at this time was just stored",
            ["time"],
          );
        throw e;
      });
    await recordAuditWith(client, {
      organizationId,
      ...args.actor,
      action: "tank.dip_entered",
      subject: `${meter.id}@${time.toISOString()}`,
      siteId: meter.siteId,
      meterId: meter.id,
      after: { dippedAt: time.toISOString(), stockL: dip.stockL },
      reason: body.note ?? null,
    });
    const before = entries.dips.filter((x) => x.time < time).at(-1);
    const after = entries.dips.find((x) => x.time > time);
    return applyChange(
      client,
      organizationId,
      meter,
      periods,
      { from: before?.time ?? time, to: after?.time ?? time },
      { reason: `Tank dip of ${dip.stockL} l entered`, ...args.actor },
    );
  });
}

/** A delivery: its period changes, and the fuel of the periods after it. */
export async function addTankDelivery(args: {
  organizationId: string;
  meter: TankMeter;
  body: TankDeliveryBody;
  actor: TankActor;
  now?: Date;
}): Promise<EntryOutcome & { id: string }> {
  const { organizationId, meter, body } = args;
  const time = new Date(body.time);
  requireTimeInService(meter, time, args.now ?? new Date());
  return withTransaction(pool, async (client) => {
    const tank = await lockedTank(client, organizationId, meter);
    requireWithinCapacity("volume_l", body.volume_l, tank);
    const entries = await readEntries(client, organizationId, meter.id);
    const delivery: TankDelivery = {
      time,
      volumeL: String(body.volume_l),
      densityKgL:
        body.density_kg_l === undefined ? null : String(body.density_kg_l),
      calorificValueMjKg:
        body.calorific_value_mj_kg === undefined
          ? null
          : String(body.calorific_value_mj_kg),
    };
    // More fuel in can only raise a consumption, but the check is one rule.
    const periods = balancedPeriods(tank, entries.dips, [
      ...entries.deliveries,
      delivery,
    ]);
    const { rows } = await client.query<{ id: string }>(
      `insert into tank_deliveries (organization_id, meter_id, delivered_at, volume_l, density_kg_l, calorific_value_mj_kg, note)
       values ($1, $2, $3, $4, $5, $6, $7) returning id`,
      [
        organizationId,
        meter.id,
        time,
        delivery.volumeL,
        delivery.densityKgL,
        delivery.calorificValueMjKg,
        body.note ?? "",
      ],
    );
    await recordAuditWith(client, {
      organizationId,
      ...args.actor,
      action: "tank.delivery_entered",
      subject: rows[0].id,
      siteId: meter.siteId,
      meterId: meter.id,
      after: {
        deliveredAt: time.toISOString(),
        volumeL: delivery.volumeL,
        densityKgL: delivery.densityKgL,
        calorificValueMjKg: delivery.calorificValueMjKg,
      },
      reason: body.note ?? null,
    });
    // The delivery belongs to (opening, closing]: from the dip before it.
    const opening = entries.dips.filter((x) => x.time < time).at(-1);
    const lastDip = entries.dips.at(-1);
    const outcome =
      opening && lastDip && lastDip.time >= time
        ? await applyChange(
            client,
            organizationId,
            meter,
            periods,
            { from: opening.time, to: lastDip.time },
            {
              reason: `Tank delivery of ${delivery.volumeL} l entered`,
              ...args.actor,
            },
          )
        : { periods: [], adjustments: 0 };
    return { ...outcome, id: rows[0].id };
  });
}

/**
 * The demo seed's bulk path: every dip and delivery of a tank at once, then
 * all its intervals in one write (the entries are checked as one balance).
 */
export async function seedTankHistory(args: {
  organizationId: string;
  meter: TankMeter;
  dips: readonly StoredDip[];
  deliveries: readonly TankDelivery[];
}): Promise<void> {
  const { organizationId, meter } = args;
  await withTransaction(pool, async (client) => {
    const tank = await lockedTank(client, organizationId, meter);
    const periods = balancedPeriods(tank, args.dips, args.deliveries);
    await client.query(
      `insert into tank_dips (organization_id, meter_id, dipped_at, stock_l, note)
       select $1, $2, t, s, n from unnest($3::timestamptz[], $4::numeric[], $5::text[]) as u(t, s, n)`,
      [
        organizationId,
        meter.id,
        args.dips.map((x) => x.time),
        args.dips.map((x) => x.stockL),
        args.dips.map((x) => x.note),
      ],
    );
    await client.query(
      `insert into tank_deliveries (organization_id, meter_id, delivered_at, volume_l, density_kg_l, calorific_value_mj_kg)
       select $1, $2, t, v, d, c from unnest($3::timestamptz[], $4::numeric[], $5::numeric[], $6::numeric[]) as u(t, v, d, c)`,
      [
        organizationId,
        meter.id,
        args.deliveries.map((x) => x.time),
        args.deliveries.map((x) => x.volumeL),
        args.deliveries.map((x) => x.densityKgL ?? null),
        args.deliveries.map((x) => x.calorificValueMjKg ?? null),
      ],
    );
    if (periods.length === 0) return;
    await applyChange(
      client,
      organizationId,
      meter,
      periods,
      { from: periods[0].from, to: periods[periods.length - 1].to },
      { reason: "Demo tank history", actorUserId: null },
    );
  });
}
