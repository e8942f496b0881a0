import { and, eq, isNull } from "drizzle-orm";
import { db, pool } from "~/db/client.server";
import { monthCloses, monthlyRollups } from "~/db/schema";
import { monthKey } from "~/lib/months";
import { residualFlag } from "~/ledger/balance";
import { silentMeters } from "~/overview/estate-overview.server";

export type AlertKind = "silent_meter" | "residual" | "month_ready";

/** One condition that holds now, keyed so that it is reported once. */
export interface Condition {
  kind: AlertKind;
  subject: string;
  /** The site it is about, by name; null for the whole organisation. */
  site: string | null;
  title: string;
  detail: string;
}

/** The UTC month before `now`'s, which the monthly checks look at. */
function previousMonth(now: Date): string {
  return monthKey(
    new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)),
  );
}

export async function silentMeterConditions(
  organizationId: string,
  hours: number,
  now: Date,
): Promise<Condition[]> {
  const silent = await silentMeters(organizationId, hours, now);
  return silent.map((m) => ({
    kind: "silent_meter",
    subject: m.meter_id,
    site: m.site_name,
    title: `No data from meter ${m.code} for over ${hours} hours`,
    detail: `${m.name} at ${m.site_name}: ${m.last_hour ? `last actual hour ${m.last_hour}` : "no actual hour yet"}.`,
  }));
}

/** Parent meters whose sub-meters miss them by more than the tolerance last month. */
export async function residualConditions(
  organizationId: string,
  now: Date,
): Promise<Condition[]> {
  const month = previousMonth(now);
  const { rows } = await pool.query<{
    parent_id: string;
    code: string;
    site_name: string;
    parent_kwh: string;
    children_kwh: string;
  }>(
    `select p.id as parent_id, p.code, s.name as site_name, pr.energy_kwh::text as parent_kwh,
            coalesce(sum(cr.energy_kwh), 0)::text as children_kwh
       from meters p
       join sites s on s.organization_id = p.organization_id and s.id = p.site_id
       join monthly_rollups pr on pr.organization_id = p.organization_id and pr.meter_id = p.id and pr.month = to_date($2, 'YYYY-MM')
       join meters c on c.organization_id = p.organization_id and c.parent_meter_id = p.id
       left join monthly_rollups cr on cr.organization_id = c.organization_id and cr.meter_id = c.id and cr.month = pr.month
      where p.organization_id = $1
      group by p.id, p.code, s.name, pr.energy_kwh`,
    [organizationId, month],
  );
  return rows
    .filter((r) => residualFlag(r.parent_kwh, r.children_kwh) !== "ok")
    .map((r) => ({
      kind: "residual",
      subject: `${r.parent_id}@${month}`,
      site: r.site_name,
      title: `Sub-metering residual out of tolerance: ${r.code}, ${month}`,
      detail: `${r.site_name}: the parent registered ${r.parent_kwh} kWh, its sub-meters ${r.children_kwh} kWh.`,
    }));
}

/** Last month, once it has ended, until someone closes it for the organisation. */
export async function monthReadyConditions(
  organizationId: string,
  now: Date,
): Promise<Condition[]> {
  const month = previousMonth(now);
  const firstDay = `${month}-01`;
  const [closed, data] = await Promise.all([
    db.$count(
      monthCloses,
      and(
        eq(monthCloses.organizationId, organizationId),
        eq(monthCloses.month, firstDay),
        isNull(monthCloses.reopenedAt),
        isNull(monthCloses.siteId),
      ),
    ),
    db
      .select({ month: monthlyRollups.month })
      .from(monthlyRollups)
      .where(
        and(
          eq(monthlyRollups.organizationId, organizationId),
          eq(monthlyRollups.month, firstDay),
        ),
      )
      .limit(1),
  ]);
  if (closed > 0 || data.length === 0) return [];
  return [
    {
      kind: "month_ready",
      subject: month,
      site: null,
      title: `${month} is ready to close`,
      detail:
        "The month has ended; closing it locks its figures, and later corrections become adjusting entries.",
    },
  ];
}
