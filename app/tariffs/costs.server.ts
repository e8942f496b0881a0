/**
 * The cost of each supply's months, kept beside the energy rollups: computed
 * from the intervals when a tariff changes, and again for any month whose
 * rollups have changed since (a read of the ledger brings those up to date
 * first). A change to the cost of a closed month is written as a cost
 * adjusting entry and in the audit trail, never silently (docs/costs.md).
 */
import { sql } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db, type Transaction } from "~/db/client.server";
import { deliveredSignSql } from "~/ledger/delivered";
import { bandWeek } from "./band-week";
import { monthCost, type PricedVersion } from "./cost";
import { tariffRatesSchema } from "./tariff-schema";

/** Serialises cost refreshes per organisation (with hashtext of its id). */
const COST_LOCK = 20_261_216;

export interface CostChange {
  /** tariff: its versions changed; energy: the month's intervals changed. */
  source: "tariff" | "energy";
  reason: string;
  actorUserId: string | null;
  actorTokenId?: string | null;
}

/** Every tariff of the organisation with the meters it prices (docs/costs.md). */
export const tariffMetersCte = sql`tariff_meters as (
  select t.id as tariff_id, m.id as meter_id
    from tariffs t
    join meters m on m.organization_id = t.organization_id
     and (m.id = t.meter_id
          or (t.meter_id is null and m.site_id = t.site_id and m.carrier = t.carrier
              and m.parent_meter_id is null and m.position = 'boundary'
              and not exists (select 1 from tariffs o
                               where o.organization_id = t.organization_id and o.meter_id = m.id))))`;

async function lockCosts(tx: Transaction, organizationId: string) {
  await tx.execute(
    sql`select pg_advisory_xact_lock(${COST_LOCK}, hashtext(${organizationId}))`,
  );
}

async function pricedVersions(
  tx: Transaction,
  organizationId: string,
  tariffId: string,
): Promise<PricedVersion[]> {
  const { rows } = await tx.execute<{
    valid_from: string;
    valid_to: string | null;
    rates: unknown;
  }>(sql`select valid_from::text, valid_to::text, rates from tariff_versions
          where organization_id = ${organizationId} and tariff_id = ${tariffId}
          order by valid_from`);
  return rows.map((r) => {
    const rates = tariffRatesSchema.parse(r.rates);
    const week = bandWeek(rates.bands);
    if (!week.ok)
      throw new Error(`stored tariff bands invalid: ${week.reason}`);
    return {
      validFrom: r.valid_from,
      validTo: r.valid_to,
      rates,
      week: week.value,
    };
  });
}

type TariffHead = {
  site_id: string;
  time_zone: string;
  currency: string;
  name: string;
};

async function tariffHead(
  tx: Transaction,
  organizationId: string,
  tariffId: string,
): Promise<TariffHead> {
  const { rows } = await tx.execute<TariffHead>(
    sql`select t.site_id, s.time_zone, t.currency, t.name from tariffs t
          join sites s on s.organization_id = t.organization_id and s.id = t.site_id
         where t.organization_id = ${organizationId} and t.id = ${tariffId}`,
  );
  return rows[0];
}

/** Computes one supply's month and stores it; a closed month's change becomes an adjusting entry. */
async function recomputeMonth(
  tx: Transaction,
  organizationId: string,
  tariffId: string,
  month: string,
  versions: PricedVersion[],
  head: TariffHead,
  change: CostChange,
): Promise<void> {
  const first = `${month}-01`;
  const { rows: intervals } = await tx.execute<{
    start_ms: string;
    minutes: number;
    kwh: string;
  }>(sql`with ${tariffMetersCte}
     select (extract(epoch from i.interval_start) * 1000)::bigint::text as start_ms,
            m.interval_minutes as minutes,
            (${sql.raw(deliveredSignSql("m.carrier"))} * i.energy_kwh)::text as kwh
       from tariff_meters tm
       join meters m on m.organization_id = ${organizationId} and m.id = tm.meter_id
       join intervals i on i.organization_id = ${organizationId} and i.meter_id = tm.meter_id
      where tm.tariff_id = ${tariffId}
        and i.interval_start >= (${first}::date::timestamp at time zone ${head.time_zone})
        and i.interval_start < ((${first}::date + interval '1 month')::timestamp at time zone ${head.time_zone})`);
  const parts = monthCost({
    timeZone: head.time_zone,
    month,
    versions,
    intervals: intervals.map((i) => ({
      startMs: Number(i.start_ms),
      minutes: Number(i.minutes),
      deliveredKwh: i.kwh,
    })),
  });
  const { rows } = await tx.execute<{
    before: string | null;
    after: string;
    closed: boolean;
  }>(sql`with ${tariffMetersCte}, seen as (
       select max(r.updated_at) as at from tariff_meters tm
         join monthly_rollups r on r.organization_id = ${organizationId} and r.meter_id = tm.meter_id
        where tm.tariff_id = ${tariffId} and r.month = ${first}::date
     ), old as (
       select cost from monthly_costs
        where organization_id = ${organizationId} and tariff_id = ${tariffId} and month = ${first}::date
     ), up as (
       insert into monthly_costs as c (organization_id, tariff_id, month, cost, currency, parts, computed_at, rollups_updated_at)
       values (${organizationId}, ${tariffId}, ${first}::date, ${parts.cost}::numeric, ${head.currency},
               ${JSON.stringify(parts)}::jsonb, now(), (select at from seen))
       on conflict (organization_id, tariff_id, month) do update set
         cost = excluded.cost, currency = excluded.currency, parts = excluded.parts,
         computed_at = excluded.computed_at, rollups_updated_at = excluded.rollups_updated_at
       returning cost
     )
     select (select cost::text from old) as before, (select cost::text from up) as after,
            exists (select 1 from month_closes mc
                     where mc.organization_id = ${organizationId} and mc.month = ${first}::date
                       and mc.reopened_at is null
                       and (mc.site_id is null or mc.site_id = ${head.site_id})) as closed`);
  const outcome = rows[0];
  const { rows: delta } = await tx.execute<{ delta: string }>(
    sql`select (${outcome.after}::numeric - ${outcome.before ?? "0"}::numeric)::text as delta`,
  );
  if (!outcome.closed || Number(delta[0].delta) === 0) return;
  const { rows: adjustment } = await tx.execute<{ id: string }>(
    sql`insert into cost_adjustments (organization_id, tariff_id, month, delta_cost, currency, source, reason, actor_user_id)
        values (${organizationId}, ${tariffId}, ${first}::date, ${delta[0].delta}::numeric, ${head.currency},
                ${change.source}, ${change.reason}, ${change.actorUserId})
        returning id::text`,
  );
  await recordAudit(tx, {
    organizationId,
    actorUserId: change.actorUserId,
    actorTokenId: change.actorTokenId ?? null,
    action: "ledger.cost_adjusted",
    subject: adjustment[0].id,
    siteId: head.site_id,
    reason: change.reason,
    before: { cost: outcome.before ?? "0", currency: head.currency },
    after: { cost: outcome.after, currency: head.currency },
    details: {
      month,
      tariffId,
      tariff: head.name,
      deltaCost: delta[0].delta,
      source: change.source,
    },
  });
}

/**
 * Recomputes a supply's months that have energy, from `fromMonth` (YYYY-MM)
 * to `toMonth` (null: the last), in the caller's transaction.
 */
export async function recomputeTariffMonths(
  tx: Transaction,
  organizationId: string,
  tariffId: string,
  fromMonth: string,
  toMonth: string | null,
  change: CostChange,
): Promise<number> {
  await lockCosts(tx, organizationId);
  const head = await tariffHead(tx, organizationId, tariffId);
  const versions = await pricedVersions(tx, organizationId, tariffId);
  const { rows } = await tx.execute<{
    month: string;
  }>(sql`with ${tariffMetersCte}
     select distinct to_char(r.month, 'YYYY-MM') as month from tariff_meters tm
       join monthly_rollups r on r.organization_id = ${organizationId} and r.meter_id = tm.meter_id
      where tm.tariff_id = ${tariffId}
        and r.month >= to_date(${fromMonth}, 'YYYY-MM')
        and (${toMonth}::text is null or r.month <= to_date(${toMonth}, 'YYYY-MM'))
      order by month`);
  for (const { month } of rows)
    await recomputeMonth(
      tx,
      organizationId,
      tariffId,
      month,
      versions,
      head,
      change,
    );
  return rows.length;
}

/**
 * Brings the cost of every supply month in [from, to] (YYYY-MM) up to date
 * with its rollups: months never computed, and months whose energy changed
 * since. A closed month whose energy changed gets a cost adjusting entry
 * beside the energy's own.
 */
export async function refreshStaleCosts(
  organizationId: string,
  from: string,
  to: string,
): Promise<number> {
  const stale = async (tx: Transaction) =>
    (
      await tx.execute<{
        tariff_id: string;
        month: string;
      }>(sql`with ${tariffMetersCte}
         select tm.tariff_id, to_char(r.month, 'YYYY-MM') as month
           from tariff_meters tm
           join monthly_rollups r on r.organization_id = ${organizationId} and r.meter_id = tm.meter_id
           left join monthly_costs c on c.organization_id = ${organizationId}
                and c.tariff_id = tm.tariff_id and c.month = r.month
          where r.month between to_date(${from}, 'YYYY-MM') and to_date(${to}, 'YYYY-MM')
          group by tm.tariff_id, r.month
         having bool_or(c.tariff_id is null or c.rollups_updated_at is null
                        or r.updated_at > c.rollups_updated_at)
          order by tm.tariff_id, month`)
    ).rows;
  // A cheap look first, without the lock: most reads find nothing to do.
  const due = await db.transaction(stale);
  if (due.length === 0) return 0;
  return db.transaction(async (tx) => {
    await lockCosts(tx, organizationId);
    const pairs = await stale(tx);
    const byTariff = new Map<string, string[]>();
    for (const p of pairs)
      byTariff.set(p.tariff_id, [
        ...(byTariff.get(p.tariff_id) ?? []),
        p.month,
      ]);
    for (const [tariffId, months] of byTariff) {
      const head = await tariffHead(tx, organizationId, tariffId);
      const versions = await pricedVersions(tx, organizationId, tariffId);
      for (const month of months)
        await recomputeMonth(
          tx,
          organizationId,
          tariffId,
          month,
          versions,
          head,
          {
            source: "energy",
            reason: "The month's energy changed after it was closed",
            actorUserId: null,
          },
        );
    }
    return pairs.length;
  });
}
