import { pool } from "~/db/client.server";
import { refreshRollupsNow } from "~/ledger/refresh-rollups.server";
import { estimateGaps } from "./estimate";
import { detectNegative, detectSpikes } from "./validate";
import type { HourlyPoint, Quality } from "./series";

const WEEK_MS = 7 * 86_400_000;
/** Weeks of history loaded before a gap, for the weekday × hour profile. */
const PROFILE_WEEKS = 8;

interface MeterFacts {
  timeZone: string;
  spikeFactor: number;
  orientation: "import" | "export";
  carrier: string;
}

async function meterFacts(
  organizationId: string,
  meterId: string,
): Promise<MeterFacts | null> {
  const { rows } = await pool.query<{
    time_zone: string;
    spike_factor: string;
    orientation: "import" | "export";
    carrier: string;
  }>(
    `select s.time_zone, m.spike_factor, m.orientation, m.carrier
       from meters m join sites s on s.organization_id = m.organization_id and s.id = m.site_id
      where m.organization_id = $1 and m.id = $2`,
    [organizationId, meterId],
  );
  const r = rows[0];
  return r
    ? {
        timeZone: r.time_zone,
        spikeFactor: Number(r.spike_factor),
        orientation: r.orientation,
        carrier: r.carrier,
      }
    : null;
}

/** The window to look at: from the known hour before `from`, less the profile history. */
async function windowFor(
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
) {
  const { rows } = await pool.query<{
    before: Date | null;
    after: Date | null;
  }>(
    `select (select max(hour_start) from intervals where organization_id = $1 and meter_id = $2
               and hour_start < $3 and quality in ('measured', 'edited')) as before,
            (select min(hour_start) from intervals where organization_id = $1 and meter_id = $2
               and hour_start > $4 and quality in ('measured', 'edited')) as after`,
    [organizationId, meterId, from, to],
  );
  const start = new Date(
    (rows[0].before ?? from).getTime() - PROFILE_WEEKS * WEEK_MS,
  );
  return { start, end: rows[0].after ?? to };
}

async function loadSeries(
  organizationId: string,
  meterId: string,
  start: Date,
  end: Date,
): Promise<HourlyPoint[]> {
  const { rows } = await pool.query<{
    hour_start: Date;
    energy_kwh: string;
    quality: Quality;
    estimate_method: string | null;
  }>(
    `select hour_start, energy_kwh, quality, estimate_method from intervals
      where organization_id = $1 and meter_id = $2 and hour_start >= $3 and hour_start <= $4
      order by hour_start`,
    [organizationId, meterId, start, end],
  );
  return rows.map((r) => ({
    hourStart: r.hour_start,
    energyKwh: Number(r.energy_kwh),
    quality: r.quality,
    registerSpread: r.estimate_method === "register_spread",
  }));
}

/** Chilled water and export meters carry negative values by nature. */
function expectedSign(facts: MeterFacts): 1 | -1 {
  const natural = facts.carrier === "cooling" ? -1 : 1;
  return (facts.orientation === "export" ? -natural : natural) as 1 | -1;
}

/**
 * Fills the meter's gaps around a changed range with marked estimates and
 * flags spikes and wrong-sign hours. Measured and edited hours are never
 * overwritten; a later measurement replaces an estimate (store-readings).
 */
export async function estimateMeter(
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
): Promise<void> {
  const facts = await meterFacts(organizationId, meterId);
  if (!facts) return;
  const { start, end } = await windowFor(organizationId, meterId, from, to);
  const series = await loadSeries(organizationId, meterId, start, end);
  const estimates = estimateGaps(series, {
    timeZone: facts.timeZone,
    profileWeeks: PROFILE_WEEKS,
  });
  if (estimates.length > 0) {
    await pool.query("select ensure_month_partitions($1, $2)", [
      estimates[0].hourStart,
      estimates.at(-1)!.hourStart,
    ]);
    await pool.query(
      `insert into intervals (organization_id, meter_id, hour_start, energy_kwh, quality, estimate_method)
       select $1, $2, h, k, 'estimated', m from unnest($3::timestamptz[], $4::numeric[], $5::text[]) as u(h, k, m)
       on conflict (organization_id, meter_id, hour_start) do update set
         energy_kwh = excluded.energy_kwh, estimate_method = excluded.estimate_method, updated_at = now()
       where intervals.quality in ('estimated', 'missing')`,
      [
        organizationId,
        meterId,
        estimates.map((e) => e.hourStart),
        estimates.map((e) => e.energyKwh.toFixed(6)),
        estimates.map((e) => e.method),
      ],
    );
    await refreshRollupsNow(
      organizationId,
      meterId,
      estimates[0].hourStart,
      new Date(estimates.at(-1)!.hourStart.getTime() + 3_600_000),
      { source: "estimate", reason: "gap estimates updated" },
    );
  }
  await flagHours(
    organizationId,
    meterId,
    "spike",
    detectSpikes(series, facts.spikeFactor),
  );
  await flagHours(
    organizationId,
    meterId,
    "wrong_sign",
    detectNegative(series, expectedSign(facts)),
  );
}

async function flagHours(
  organizationId: string,
  meterId: string,
  flag: string,
  points: HourlyPoint[],
) {
  if (points.length === 0) return;
  await pool.query(
    `update intervals set flags = array_append(flags, $3)
      where organization_id = $1 and meter_id = $2 and hour_start = any($4::timestamptz[]) and not ($3 = any(flags))`,
    [organizationId, meterId, flag, points.map((p) => p.hourStart)],
  );
}
