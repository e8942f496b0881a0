import { listBaselines, siteMonths } from "~/baselines/baselines.server";
import { avoidedEnergy, monthsFitted, predict } from "~/baselines/regression";
import { and, count, eq, exists, isNull } from "drizzle-orm";
import { db, pool } from "~/db/client.server";
import { baselines, gateways, meters, sites } from "~/db/schema";
import type { Carrier } from "~/sites/meter-kinds";
import { deliveredSignSql } from "~/ledger/delivered";
import { activeSitesOf, siteOfMeter } from "~/db/conditions.server";

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
  const { rows } = await pool.query<{
    site_id: string;
    site_name: string;
    carrier: Carrier;
    delivered: string | null;
    previous: string | null;
  }>(
    `select s.id as site_id, s.name as site_name, m.carrier::text as carrier,
            sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where r.month = to_date($2, 'YYYY-MM'))::text as delivered,
            sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where r.month = to_date($2, 'YYYY-MM') - interval '1 year')::text as previous
       from sites s
       join meters m on m.organization_id = s.organization_id and m.site_id = s.id
        and m.parent_meter_id is null and m.orientation = 'import'
       join monthly_rollups r on r.organization_id = m.organization_id and r.meter_id = m.id
        and r.month in (to_date($2, 'YYYY-MM'), (to_date($2, 'YYYY-MM') - interval '1 year')::date)
      where s.organization_id = $1 and s.archived_at is null
      group by s.id, s.name, m.carrier`,
    [organizationId, month],
  );
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
  const { rows } = await pool.query<SilentMeter>(
    `select m.id as meter_id, m.code, m.name, s.name as site_name,
            to_char(last.hour_start at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') as last_hour,
            floor(extract(epoch from ($3::timestamptz - last.hour_start)) / 3600)::int as silent_hours
       from meters m
       join sites s on s.organization_id = m.organization_id and s.id = m.site_id
       left join lateral (
         select i.hour_start from intervals i
          where i.organization_id = m.organization_id and i.meter_id = m.id and i.quality = 'measured'
          order by i.hour_start desc limit 1) last on true
      where m.organization_id = $1 and m.removed_at is null
        and (last.hour_start is null or last.hour_start < $3::timestamptz - make_interval(hours => $2))
      order by last.hour_start nulls first, m.code`,
    [organizationId, hours, now],
  );
  return rows;
}

/** Share of the last `days` days' hours that were measured, over installed meters. */
export async function completeness(
  organizationId: string,
  days: number,
  now = new Date(),
) {
  const { rows } = await pool.query<{
    measured: string;
    estimated: string;
    expected: string;
  }>(
    `select (select count(*) from intervals i
              where i.organization_id = $1 and i.hour_start >= $3::timestamptz - make_interval(days => $2)
                and i.hour_start < $3 and i.quality in ('measured', 'edited')) as measured,
            (select count(*) from intervals i
              where i.organization_id = $1 and i.hour_start >= $3::timestamptz - make_interval(days => $2)
                and i.hour_start < $3 and i.quality = 'estimated') as estimated,
            (select count(*) * $2 * 24 from meters m where m.organization_id = $1 and m.removed_at is null) as expected`,
    [organizationId, days, now],
  );
  const r = rows[0];
  const expected = Number(r.expected);
  return {
    measuredShare: expected ? Number(r.measured) / expected : 0,
    estimatedShare: expected ? Number(r.estimated) / expected : 0,
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
  const { rows } = await pool.query<{
    month: string;
    carrier: Carrier;
    delivered: string;
    exported: string;
  }>(
    `select to_char(r.month, 'YYYY-MM') as month, m.carrier::text as carrier,
            coalesce(sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where m.orientation = 'import'), 0)::text as delivered,
            coalesce(sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where m.orientation = 'export'), 0)::text as exported
       from monthly_rollups r join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
      where r.organization_id = $1 and m.parent_meter_id is null
        and r.month between to_date($2, 'YYYY-MM') and to_date($3, 'YYYY-MM')
      group by 1, 2 order by 1, 2`,
    [organizationId, from, to],
  );
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
