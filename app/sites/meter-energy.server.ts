import { pool } from "~/db/client.server";

/** Signed energy per meter of one site since a time, from the hourly intervals. */
export async function siteEnergySince(args: {
  organizationId: string;
  siteId: string;
  since: Date;
}) {
  const { rows } = await pool.query<{ meter_id: string; energy_kwh: string }>(
    `select i.meter_id, sum(i.energy_kwh) as energy_kwh
       from intervals i join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
      where i.organization_id = $1 and m.site_id = $2 and i.hour_start >= $3
      group by i.meter_id`,
    [args.organizationId, args.siteId, args.since],
  );
  return new Map(rows.map((r) => [r.meter_id, Number(r.energy_kwh)]));
}
