/**
 * Where the server's demo readings end: for each scenario meter of the
 * organisation the demo gateway key belongs to (still installed), the time of
 * its newest stored reading. Read-only; the readings themselves go through
 * the API.
 */
import type pg from "pg";
import { hashToken } from "../../app/auth/tokens.server";
import { METERS } from "../scenario/larchmere-estate";
import type { StoredUntil } from "./feed";

export async function storedUntil(
  pool: pg.Pool,
  gatewayKey: string,
): Promise<StoredUntil> {
  const { rows } = await pool.query<{ code: string; last: Date | null }>(
    `select m.code,
            (select max(r.reading_time) from raw_readings r
              where r.organization_id = m.organization_id and r.meter_id = m.id) as last
       from gateways g
       join meters m on m.organization_id = g.organization_id
      where g.key_hash = $1 and g.revoked_at is null
        and m.removed_at is null and m.code = any($2::text[])`,
    [hashToken(gatewayKey), METERS.map((m) => m.code)],
  );
  return new Map(rows.map((r) => [r.code, r.last]));
}
