import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import {
  createMeteredOrg,
  METERS_INSTALLED_AT,
  type MeteredOrg,
} from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

const post = async (org: MeteredOrg, readings: unknown[]) => {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
};

/** Hourly register reads from `start`, `hours` steps of `step` kWh each. */
function registerSeries(
  code: string,
  start: string,
  hours: number,
  first: number,
  step: number,
) {
  const t0 = new Date(start).getTime();
  return Array.from({ length: hours + 1 }, (_, i) => ({
    meter: code,
    quantity: "electric_register",
    time: new Date(t0 + i * 3_600_000).toISOString(),
    register_kwh: Math.round((first + i * step) * 1000) / 1000,
  }));
}

/**
 * A metered organisation whose register meter gets a sub-meter, and ten hours
 * of June 2026 on both: the parent advances 10 kWh an hour, the sub-meter
 * `subStep` kWh an hour.
 */
async function subMetered(subStep: number) {
  const org = await createMeteredOrg({ roles: ["owner"] });
  const [sub] = await db
    .insert(schema.meters)
    .values({
      organizationId: org.org.id,
      siteId: org.siteId,
      code: `S-${org.tag}`,
      name: `Block sub-meter ${org.tag}`,
      quantity: "electric_register",
      carrier: "electricity",
      orientation: "import",
      parentMeterId: org.meters.register.id,
      installedAt: METERS_INSTALLED_AT,
    })
    .returning({ id: schema.meters.id, code: schema.meters.code });
  await post(org, [
    ...registerSeries(
      org.meters.register.code,
      "2026-06-10T08:00:00Z",
      10,
      1000,
      10,
    ),
    ...registerSeries(sub.code, "2026-06-10T08:00:00Z", 10, 50, subStep),
  ]);
  const client = new Client();
  await client.signIn(org.org.members[0].email, org.org.members[0].password);
  return { org, sub, client };
}

/** The page's visible text: tags and React's text separators removed. */
async function pageText(client: Client, path: string) {
  const response = await client.get(path);
  expect(response.status).toBe(200);
  const html = await response.text();
  const body = html.slice(0, html.indexOf("<script"));
  return body
    .replace(/<!--.*?-->/g, "")
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;/g, "'")
    .replace(/\s+/g, " ");
}

const sitePath = (org: MeteredOrg) => `/o/${org.org.id}/sites/${org.siteId}`;

describe("site energy balance", () => {
  it("shows a parent's residual from the monthly rollups and flags it beyond the tolerance", async () => {
    const { org, sub, client } = await subMetered(8);
    // The rollups hold the exact sums of the intervals: 100 kWh and 80 kWh.
    const { rows } = await pool.query<{ meter_id: string; e: string }>(
      `select meter_id, sum(energy_kwh)::text as e from intervals
        where organization_id = $1 and meter_id = any($2::uuid[]) group by meter_id`,
      [org.org.id, [org.meters.register.id, sub.id]],
    );
    const sums = Object.fromEntries(rows.map((r) => [r.meter_id, r.e]));
    expect(sums[org.meters.register.id]).toBe("100.000000");
    expect(sums[sub.id]).toBe("80.000000");

    const text = await pageText(client, `${sitePath(org)}?month=2026-06`);
    expect(text).toContain("Energy balance");
    expect(text).toMatch(
      new RegExp(
        `${org.meters.register.code} Electricity register ${org.tag} \\(1 sub-meter\\) \\+100\\.0 \\+80\\.0 \\+20\\.0 20\\.0 % Over tolerance`,
      ),
    );
    // Boundary totals: the sub-meter sits inside the boundary and is not added.
    expect(text).toContain(
      "Electricity delivered +100 kWh · exported 0 kWh · net +100 kWh",
    );
    // Without ?month the page shows the newest month with data, the same one.
    const newest = await pageText(client, sitePath(org));
    expect(newest).toContain("20.0 % Over tolerance");
    expect(newest).toContain("June 2026");
  });

  it("a residual within the tolerance is not flagged; sub-meters above the parent are", async () => {
    const within = await subMetered(9.6);
    const text = await pageText(
      within.client,
      `${sitePath(within.org)}?month=2026-06`,
    );
    expect(text).toContain("+100.0 +96.0 +4.0 4.0 % Within tolerance");
    expect(text).not.toContain("Over tolerance");

    const exceeding = await subMetered(10.5);
    const flagged = await pageText(
      exceeding.client,
      `${sitePath(exceeding.org)}?month=2026-06`,
    );
    expect(flagged).toContain(
      "+100.0 +105.0 −5.0 −5.0 % Sub-meters exceed parent",
    );
    expect(flagged).toContain("its sub-meters add up to more than it reads");
  });

  it("a month without figures says so; another organisation gets 404", async () => {
    const { org, client } = await subMetered(8);
    const empty = await pageText(client, `${sitePath(org)}?month=2026-01`);
    expect(empty).toContain("Nothing crossed the boundary in January 2026.");

    const other = await createOrganization(["owner"]);
    const stranger = new Client();
    await stranger.signIn(other.members[0].email, other.members[0].password);
    expect((await stranger.get(`${sitePath(org)}?month=2026-06`)).status).toBe(
      404,
    );
    // Nor through the stranger's own organisation.
    expect(
      (await stranger.get(`/o/${other.id}/sites/${org.siteId}?month=2026-06`))
        .status,
    ).toBe(404);
  });
});
