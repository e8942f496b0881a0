import { pool } from "./db";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * Waits until the server's background estimation has settled for an
 * organisation: its hours stop changing (count and newest update the same
 * three polls running). Posting readings with a gap starts gap filling after
 * the answer, so a test that reads the ledger twice waits for it first.
 */
export async function estimationSettled(organizationId: string) {
  let last = "";
  let same = 0;
  for (const deadline = Date.now() + 20_000; Date.now() < deadline;) {
    const { rows } = await pool.query<{ state: string }>(
      `select count(*) || '|' || coalesce(max(updated_at)::text, '') as state
         from intervals where organization_id = $1`,
      [organizationId],
    );
    same = rows[0].state === last ? same + 1 : 0;
    if (same >= 3) return;
    last = rows[0].state;
    await sleep(400);
  }
  throw new Error("the hours kept changing for 20 s");
}
