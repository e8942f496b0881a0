import type { Interval } from "./interval-schema";
import { pool } from "~/db/client.server";

/** One meter's hourly intervals in [from, to), oldest first. */
export async function listIntervals(args: {
  organizationId: string;
  meterId: string;
  from: Date;
  to: Date;
}) {
  const { rows } = await pool.query<Interval>(
    `select to_char(hour_start at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') as hour_start,
            energy_kwh::text, quality, flags, estimate_method,
            cardinality(source_reading_times) as source_count
       from intervals
      where organization_id = $1 and meter_id = $2 and hour_start >= $3 and hour_start < $4
      order by hour_start`,
    [args.organizationId, args.meterId, args.from, args.to],
  );
  return rows;
}

export async function latestIntervalHour(args: {
  organizationId: string;
  meterId: string;
}): Promise<Date | null> {
  const { rows } = await pool.query<{ latest: Date | null }>(
    `select max(hour_start) as latest from intervals where organization_id = $1 and meter_id = $2`,
    [args.organizationId, args.meterId],
  );
  return rows[0]?.latest ?? null;
}
