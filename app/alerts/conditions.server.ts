import { and, eq, isNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "~/db/client.server";
import { meters, monthCloses, monthlyRollups, sites } from "~/db/schema";
import { monthKey } from "~/lib/months";
import { residualFlag } from "~/ledger/balance";
import { silentMeters } from "~/overview/estate-overview.server";
import { plantFaults } from "~/plant/plant-faults.server";

export type AlertKind =
  "silent_meter" | "residual" | "month_ready" | "plant_fault";

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
  const parent = alias(meters, "p");
  const child = alias(meters, "c");
  const parentMonth = alias(monthlyRollups, "pr");
  const childMonth = alias(monthlyRollups, "cr");
  const rows = await db
    .select({
      parent_id: parent.id,
      code: parent.code,
      site_name: sites.name,
      parent_kwh: parentMonth.energyKwh,
      children_kwh: sql<string>`coalesce(sum(${childMonth.energyKwh}), 0)::text`,
    })
    .from(parent)
    .innerJoin(
      sites,
      and(
        eq(sites.organizationId, parent.organizationId),
        eq(sites.id, parent.siteId),
      ),
    )
    .innerJoin(
      parentMonth,
      and(
        eq(parentMonth.organizationId, parent.organizationId),
        eq(parentMonth.meterId, parent.id),
        eq(parentMonth.month, `${month}-01`),
      ),
    )
    .innerJoin(
      child,
      and(
        eq(child.organizationId, parent.organizationId),
        eq(child.parentMeterId, parent.id),
      ),
    )
    .leftJoin(
      childMonth,
      and(
        eq(childMonth.organizationId, child.organizationId),
        eq(childMonth.meterId, child.id),
        eq(childMonth.month, parentMonth.month),
      ),
    )
    .where(eq(parent.organizationId, organizationId))
    .groupBy(parent.id, parent.code, sites.name, parentMonth.energyKwh);
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

/**
 * Plant whose last month broke a law (app/plant/): one alert per plant and
 * month, naming the plant's meters, one of which reads wrongly.
 */
export async function plantFaultConditions(
  organizationId: string,
  now: Date,
): Promise<Condition[]> {
  const month = previousMonth(now);
  const faults = await plantFaults({
    organizationId,
    siteId: null,
    months: [month],
  });
  return faults.map((f) => ({
    kind: "plant_fault",
    subject: `${f.plantId}:${f.month}`,
    site: f.siteName,
    title: `Metering fault at ${f.plantName} (${f.siteName}), ${f.month}`,
    detail: `${f.text} Meters: ${f.meterCodes.join(", ")}.`,
  }));
}
