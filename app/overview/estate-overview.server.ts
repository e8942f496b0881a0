import { pool } from "~/db/client.server";

export interface SiteDrift {
  site_id: string;
  site_name: string;
  month: string;
  net_kwh: number;
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
 * Each site's latest full month against the same month a year before, from
 * the rollups (boundary meters, all carriers). The biggest changes first.
 */
export async function siteDrift(
  organizationId: string,
  month: string,
): Promise<SiteDrift[]> {
  const { rows } = await pool.query<{
    site_id: string;
    site_name: string;
    net: string | null;
    previous: string | null;
  }>(
    `select s.id as site_id, s.name as site_name,
            sum(r.energy_kwh) filter (where r.month = to_date($2, 'YYYY-MM'))::text as net,
            sum(r.energy_kwh) filter (where r.month = to_date($2, 'YYYY-MM') - interval '1 year')::text as previous
       from sites s
       left join meters m on m.organization_id = s.organization_id and m.site_id = s.id and m.parent_meter_id is null
       left join monthly_rollups r on r.organization_id = m.organization_id and r.meter_id = m.id
        and r.month in (to_date($2, 'YYYY-MM'), (to_date($2, 'YYYY-MM') - interval '1 year')::date)
      where s.organization_id = $1 and s.archived_at is null
      group by s.id, s.name`,
    [organizationId, month],
  );
  return rows
    .map((r) => {
      const net = Number(r.net ?? 0);
      const previous = r.previous === null ? null : Number(r.previous);
      const change =
        previous && previous !== 0
          ? (net - previous) / Math.abs(previous)
          : null;
      return {
        site_id: r.site_id,
        site_name: r.site_name,
        month,
        net_kwh: net,
        previous_year_kwh: previous,
        change,
      };
    })
    .sort((a, b) => Math.abs(b.change ?? 0) - Math.abs(a.change ?? 0));
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

/** Net energy per month and carrier over the estate, for the overview chart. */
export async function monthlyByCarrier(
  organizationId: string,
  from: string,
  to: string,
) {
  const { rows } = await pool.query<{
    month: string;
    carrier: string;
    net: string;
  }>(
    `select to_char(r.month, 'YYYY-MM') as month, m.carrier::text as carrier, sum(r.energy_kwh)::text as net
       from monthly_rollups r join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
      where r.organization_id = $1 and m.parent_meter_id is null
        and r.month between to_date($2, 'YYYY-MM') and to_date($3, 'YYYY-MM')
      group by 1, 2 order by 1, 2`,
    [organizationId, from, to],
  );
  return rows.map((r) => ({
    month: r.month,
    carrier: r.carrier,
    net_kwh: Number(r.net),
  }));
}
