import { listBaselines, siteMonths } from "~/baselines/baselines.server";
import { avoidedEnergy, monthsFitted, predict } from "~/baselines/regression";
import {
  and,
  between,
  count,
  desc,
  eq,
  exists,
  gte,
  inArray,
  isNull,
  lt,
  or,
  sql,
} from "drizzle-orm";
import { db } from "~/db/client.server";
import {
  baselines,
  gateways,
  intervals,
  meters,
  monthlyRollups,
  sites,
} from "~/db/schema";
import type { Carrier } from "~/sites/meter-kinds";
import {
  activeSitesOf,
  deliveredSignOfMeter,
  firstDayOf,
  meterOfRollup,
  siteOfMeter,
} from "~/db/conditions.server";

/** One site and carrier: its energy delivered in a month against a year before. */
export interface SiteDrift {
  site_id: string;
  site_name: string;
  carrier: Carrier;
  month: string;
  /** Delivered energy of the carrier (≥ 0 for consistent data), kWh. */
  delivered_kwh: number;
  previous_year_kwh: number | null;
  change: number | null;
}

export interface SilentMeter {
  meter_id: string;
  code: string;
  name: string;
  site_name: string;
  last_hour: string | null;
  silent_hours: number | null;
}

/**
 * Each site's energy delivered per carrier in its latest full month, against
 * the same month a year before, from the rollups of its boundary import
 * meters (delivered.ts: chilled water is cooling delivered, positive).
 * Carriers are compared each on their own, never added. The biggest changes
 * first.
 */
export async function siteDrift(
  organizationId: string,
  month: string,
): Promise<SiteDrift[]> {
  const thisMonth = firstDayOf(month);
  const yearBefore = sql`(${firstDayOf(month)} - interval '1 year')::date`;
  const delivered = sql`${deliveredSignOfMeter} * ${monthlyRollups.energyKwh}`;
  const rows = await db
    .select({
      site_id: sites.id,
      site_name: sites.name,
      carrier: sql<Carrier>`${meters.carrier}::text`,
      delivered: sql<
        string | null
      >`(sum(${delivered}) filter (where ${monthlyRollups.month} = ${thisMonth}))::text`,
      previous: sql<
        string | null
      >`(sum(${delivered}) filter (where ${monthlyRollups.month} = ${firstDayOf(month)} - interval '1 year'))::text`,
    })
    .from(sites)
    .innerJoin(
      meters,
      and(
        siteOfMeter,
        isNull(meters.parentMeterId),
        eq(meters.position, "boundary"),
        eq(meters.orientation, "import"),
      ),
    )
    .innerJoin(
      monthlyRollups,
      and(
        meterOfRollup,
        sql`${monthlyRollups.month} in (${thisMonth}, ${yearBefore})`,
      ),
    )
    .where(activeSitesOf(organizationId))
    .groupBy(sites.id, sites.name, meters.carrier);
  return rows
    .map((r) => {
      const delivered = Number(r.delivered ?? 0);
      const previous = r.previous === null ? null : Number(r.previous);
      const change =
        previous && previous !== 0
          ? (delivered - previous) / Math.abs(previous)
          : null;
      return {
        site_id: r.site_id,
        site_name: r.site_name,
        carrier: r.carrier,
        month,
        delivered_kwh: delivered,
        previous_year_kwh: previous,
        change,
      };
    })
    .sort(
      (a, b) =>
        Math.abs(b.change ?? 0) - Math.abs(a.change ?? 0) ||
        a.site_name.localeCompare(b.site_name) ||
        a.carrier.localeCompare(b.carrier),
    );
}

/** The organisation's sites in use (not archived). */
export async function activeSiteCount(organizationId: string): Promise<number> {
  return db.$count(sites, activeSitesOf(organizationId));
}

/** How far an organisation has got with its first steps: a site, a meter, a gateway. */
export interface SetupProgress {
  sites: number;
  meters: number;
  gateways: number;
  /** The oldest active site, where a first meter goes; null without one. */
  firstSiteId: string | null;
}

export async function setupProgress(
  organizationId: string,
): Promise<SetupProgress> {
  const [siteCount, meterCount, gatewayCount, [firstSite]] = await Promise.all([
    activeSiteCount(organizationId),
    // Installed meters on sites in use.
    db
      .select({ n: count() })
      .from(meters)
      .innerJoin(sites, siteOfMeter)
      .where(
        and(
          eq(meters.organizationId, organizationId),
          isNull(meters.removedAt),
          isNull(sites.archivedAt),
        ),
      )
      .then(([row]) => row.n),
    db.$count(
      gateways,
      and(
        eq(gateways.organizationId, organizationId),
        isNull(gateways.revokedAt),
      ),
    ),
    db
      .select({ id: sites.id })
      .from(sites)
      .where(activeSitesOf(organizationId))
      .orderBy(sites.createdAt, sites.id)
      .limit(1),
  ]);
  return {
    sites: siteCount,
    meters: meterCount,
    gateways: gatewayCount,
    firstSiteId: firstSite?.id ?? null,
  };
}

/** Meters (still installed) whose newest measured hour is older than `hours`. */
export async function silentMeters(
  organizationId: string,
  hours: number,
  now = new Date(),
): Promise<SilentMeter[]> {
  const last = db
    .select({ intervalStart: intervals.intervalStart })
    .from(intervals)
    .where(
      and(
        eq(intervals.organizationId, meters.organizationId),
        eq(intervals.meterId, meters.id),
        eq(intervals.quality, "measured"),
      ),
    )
    .orderBy(desc(intervals.intervalStart))
    .limit(1)
    .as("last");
  const at = sql`${now}::timestamptz`;
  const rows: SilentMeter[] = await db
    .select({
      meter_id: meters.id,
      code: meters.code,
      name: meters.name,
      site_name: sites.name,
      last_hour: sql<
        string | null
      >`to_char(${last.intervalStart} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"')`,
      silent_hours: sql<
        number | null
      >`floor(extract(epoch from (${at} - ${last.intervalStart})) / 3600)::int`,
    })
    .from(meters)
    .innerJoin(sites, siteOfMeter)
    .leftJoinLateral(last, sql`true`)
    .where(
      and(
        eq(meters.organizationId, organizationId),
        isNull(meters.removedAt),
        or(
          isNull(last.intervalStart),
          lt(last.intervalStart, sql`${at} - make_interval(hours => ${hours})`),
        ),
      ),
    )
    .orderBy(sql`${last.intervalStart} nulls first`, meters.code);
  return rows;
}

/**
 * Share of the last `days` days' intervals that were measured, over
 * installed meters, each expected at its own resolution (48 a day for a
 * half-hourly meter).
 */
export async function completeness(
  organizationId: string,
  days: number,
  now = new Date(),
) {
  const inWindow = and(
    eq(intervals.organizationId, organizationId),
    gte(
      intervals.intervalStart,
      sql`${now}::timestamptz - make_interval(days => ${days})`,
    ),
    lt(intervals.intervalStart, now),
  );
  // Both counts from one pass over the window's intervals. A month of an
  // estate's intervals is a few tens of thousands of rows, counted in a few
  // milliseconds; PostgreSQL would plan parallel workers for it, whose
  // start-up cost the page paid many times over (docs/performance.md, "Pages").
  const [[counts], [installed]] = await Promise.all([
    db.transaction(async (tx) => {
      await tx.execute(sql`set local max_parallel_workers_per_gather = 0`);
      return tx
        .select({
          measured: sql<number>`(count(*) filter (where ${inArray(intervals.quality, ["measured", "edited"])}))::int`,
          estimated: sql<number>`(count(*) filter (where ${eq(intervals.quality, "estimated")}))::int`,
        })
        .from(intervals)
        .where(inWindow);
    }),
    db
      .select({
        perDay: sql<number>`coalesce(sum(1440 / ${meters.intervalMinutes}), 0)::int`,
      })
      .from(meters)
      .where(
        and(
          eq(meters.organizationId, organizationId),
          isNull(meters.removedAt),
        ),
      ),
  ]);
  const { measured, estimated } = counts;
  const expected = installed.perDay * days;
  return {
    measuredShare: expected ? measured / expected : 0,
    estimatedShare: expected ? estimated / expected : 0,
  };
}

/** One month and carrier over the estate, for the overview chart. */
export interface CarrierMonth {
  month: string;
  carrier: Carrier;
  /** Delivered energy, kWh (≥ 0): cooling delivered for chilled water. */
  delivered_kwh: number;
  /** Exported energy, kWh (≤ 0). */
  exported_kwh: number;
}

/**
 * Delivered and exported energy per month and carrier over the estate's
 * boundary meters, each carrier on its own (delivered.ts).
 */
export async function monthlyByCarrier(
  organizationId: string,
  from: string,
  to: string,
): Promise<CarrierMonth[]> {
  const monthKey = sql<string>`to_char(${monthlyRollups.month}, 'YYYY-MM')`;
  // By the carrier's name, not the enum's declared order.
  const carrier = sql<Carrier>`${meters.carrier}::text`;
  const delivered = sql`${deliveredSignOfMeter} * ${monthlyRollups.energyKwh}`;
  const rows = await db
    .select({
      month: monthKey,
      carrier,
      delivered: sql<string>`coalesce(sum(${delivered}) filter (where ${meters.orientation} = 'import'), 0)::text`,
      exported: sql<string>`coalesce(sum(${delivered}) filter (where ${meters.orientation} = 'export'), 0)::text`,
    })
    .from(monthlyRollups)
    .innerJoin(meters, meterOfRollup)
    .where(
      and(
        eq(monthlyRollups.organizationId, organizationId),
        isNull(meters.parentMeterId),
        eq(meters.position, "boundary"),
        between(monthlyRollups.month, firstDayOf(from), firstDayOf(to)),
      ),
    )
    .groupBy(monthKey, carrier)
    .orderBy(monthKey, carrier);
  return rows.map((r) => ({
    month: r.month,
    carrier: r.carrier,
    delivered_kwh: Number(r.delivered),
    exported_kwh: Number(r.exported),
  }));
}

export interface BaselineComparison {
  site_id: string;
  site_name: string;
  carrier: Carrier;
  /** YYYY-MM, the site-local month compared. */
  month: string;
  /** The newest saved baseline of the site and carrier. */
  baseline_id: string;
  /** What the boundary import meters measured, kWh (a magnitude); null without a ledger entry. */
  actual_kwh: number | null;
  /** The baseline's prediction for the month's degree days, kWh; null without complete weather. */
  expected_kwh: number | null;
  /** (actual − expected) / expected: positive when more was used than the weather explains. */
  difference: number | null;
  /** Why a figure is missing ("no weather", "no ledger entry", …). */
  note: string | null;
  /** The month's degree days lie outside the range the baseline was fitted on. */
  extrapolated: boolean;
  /** Calendar months the baseline was fitted on; under 12 it carries a caution. */
  months_fitted: number;
}

/**
 * Each site's newest saved baseline per carrier, applied to one month as the
 * Weather & baselines page applies it to a reporting month: the month's
 * degree days (the baseline's own driver and base temperature) put into the
 * saved model give the expected energy, set against what the boundary
 * import meters measured. Only a month with complete weather and a ledger
 * entry is compared; otherwise the row says what is missing.
 */
export async function againstBaseline(
  organizationId: string,
  month: string,
): Promise<BaselineComparison[]> {
  const withBaselines = await db
    .select({ site_id: sites.id, site_name: sites.name })
    .from(sites)
    .where(
      and(
        activeSitesOf(organizationId),
        exists(
          db
            .select({ id: baselines.id })
            .from(baselines)
            .where(
              and(
                eq(baselines.organizationId, sites.organizationId),
                eq(baselines.siteId, sites.id),
              ),
            ),
        ),
      ),
    )
    .orderBy(sites.name);
  const perSite = await Promise.all(
    withBaselines.map(async (site) => {
      // Newest first: the first of each carrier is the one in force.
      const saved = await listBaselines({
        organizationId,
        siteId: site.site_id,
      });
      const newest = saved.filter(
        (b, i) => saved.findIndex((o) => o.carrier === b.carrier) === i,
      );
      return Promise.all(
        newest.map(async (baseline): Promise<BaselineComparison> => {
          const { model } = baseline;
          const [figure] = await siteMonths({
            organizationId,
            siteId: site.site_id,
            carrier: baseline.carrier,
            driver: model.driver,
            baseC: model.baseC,
            from: month,
            to: month,
          });
          const weatherComplete = figure.weatherDays === figure.daysInMonth;
          const expected = weatherComplete ? predict(model, figure.dd) : null;
          // Avoided energy is expected − actual, as a share of expected;
          // the overview shows the other side: how far the month ran over.
          const avoidedPercent =
            figure.usable && figure.kwh !== null
              ? avoidedEnergy(model, [{ dd: figure.dd, actualKwh: figure.kwh }])
                  .avoidedPercent
              : null;
          const dds = model.points.map((p) => p.dd);
          return {
            site_id: site.site_id,
            site_name: site.site_name,
            carrier: baseline.carrier,
            month,
            baseline_id: baseline.id,
            actual_kwh: figure.kwh,
            expected_kwh: expected,
            difference: avoidedPercent === null ? null : -avoidedPercent / 100,
            note: figure.note,
            extrapolated:
              weatherComplete &&
              dds.length > 0 &&
              (figure.dd < Math.min(...dds) - 1e-9 ||
                figure.dd > Math.max(...dds) + 1e-9),
            months_fitted: monthsFitted(model.points),
          };
        }),
      );
    }),
  );
  return perSite
    .flat()
    .sort(
      (a, b) =>
        a.site_name.localeCompare(b.site_name) ||
        a.carrier.localeCompare(b.carrier),
    );
}
