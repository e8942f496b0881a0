/**
 * A meter's page shows what it sent last, so a register series can be
 * continued by hand: the newest reading's time and the newest register
 * value as read (before the multiplier), in the site's time zone.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pool } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

let org: MeteredOrg;
let manager: Client;

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["energy_manager"] });
  manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
});
afterAll(async () => {
  await pool.end();
});

/** The page's "Last reading" facts as text, markup and React's comments removed. */
async function lastReadingText(meterId: string): Promise<string> {
  const html = await (
    await manager.get(`/o/${org.org.id}/meters/${meterId}`)
  ).text();
  const at = html.indexOf("data-last-reading");
  expect(at).toBeGreaterThan(0);
  return html
    .slice(at, html.indexOf("</dl>", at))
    .replace(/<!-- -->/g, "")
    .replace(/<[^>]+>/g, " ")
    .replace(/\s+/g, " ");
}

describe("a meter's last reading", () => {
  it("says there is none before the first reading", async () => {
    expect(await lastReadingText(org.meters.register.id)).toContain(
      "No readings yet",
    );
  });

  it("shows the newest register value as read and when it was read", async () => {
    const register = (time: string, kwh: number) => ({
      meter: org.meters.register.code,
      quantity: "electric_register",
      time,
      register_kwh: kwh,
    });
    const posted = await new Client().postJson(
      "/api/v1/readings",
      {
        // Posted out of order: the newest by time wins, not the last sent.
        readings: [
          register("2026-07-02T01:00:00Z", 1012.468),
          register("2026-07-02T00:00:00Z", 1000.125),
        ],
      },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);
    const text = await lastReadingText(org.meters.register.id);
    expect(text).toContain("Last register value 1012.468 kWh");
    // 01:00 UTC on 2 July is 02:00 in London (summer time).
    expect(text).toMatch(/Read at 2 Jul 2026, 02:00/);
    expect(text).toMatch(/Last reading 2 Jul 2026, 02:00/);
  });
});
