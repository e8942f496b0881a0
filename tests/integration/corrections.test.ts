/**
 * "Correct an hour" cannot wreck a ledger: a value of the wrong sign for the
 * meter is refused, one far outside the meter's history needs a confirmation
 * that names the jump, and either way a refusal writes nothing.
 */
import { and, asc, eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

/** Heating water for one hour: 75 °C flow, 50 °C return; volume sets the size. */
function water(org: MeteredOrg, hour: string, volumeM3: number) {
  const start = new Date(`${hour}:00:00Z`);
  return {
    meter: org.meters.water.code,
    quantity: "water_heat",
    start: start.toISOString(),
    end: new Date(start.getTime() + 3_600_000).toISOString(),
    volume_m3: volumeM3,
    flow_temp_c: 75,
    return_temp_c: 50,
  };
}

async function post(org: MeteredOrg, readings: unknown[]) {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

/** Six hours of 10 March 2026 (UTC), 00:00 to 05:00, of 1.5 to 2.5 m³ each. */
async function meteredHeat() {
  const org = await createMeteredOrg({ roles: ["energy_manager"] });
  await post(
    org,
    [1.5, 2, 2.5, 1.8, 2.2, 2].map((v, h) => water(org, `2026-03-10T0${h}`, v)),
  );
  const manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
  return { org, manager };
}

const readingsPage = (org: MeteredOrg, meterId: string) =>
  `/o/${org.org.id}/meters/${meterId}/readings`;

function correct(
  manager: Client,
  org: MeteredOrg,
  fields: { intervalStart: string; energyKwh: string; confirmSpike?: string },
  meterId = org.meters.water.id,
) {
  return manager.post(readingsPage(org, meterId), {
    intent: "edit",
    reason: "Checked against the register photo",
    ...fields,
  });
}

async function hoursOf(org: MeteredOrg, meterId = org.meters.water.id) {
  return db
    .select()
    .from(schema.intervals)
    .where(
      and(
        eq(schema.intervals.organizationId, org.org.id),
        eq(schema.intervals.meterId, meterId),
      ),
    )
    .orderBy(asc(schema.intervals.intervalStart));
}

/** Everything a correction writes: hours, rollups, adjustments, audit log. */
async function snapshot(org: MeteredOrg) {
  const id = org.org.id;
  const { intervals, monthlyRollups, ledgerAdjustments, auditLog } = schema;
  return {
    intervals: await db
      .select()
      .from(intervals)
      .where(eq(intervals.organizationId, id)),
    rollups: await db
      .select()
      .from(monthlyRollups)
      .where(eq(monthlyRollups.organizationId, id)),
    adjustments: await db
      .select()
      .from(ledgerAdjustments)
      .where(eq(ledgerAdjustments.organizationId, id)),
    audit: await db
      .select()
      .from(auditLog)
      .where(eq(auditLog.organizationId, id)),
  };
}

/**
 * The median |kWh| of the water meter's stored actual (measured) hours other
 * than the one being corrected. The tests correct the newest hour: the
 * meter's history is the eight weeks before it (docs/ingest.md).
 */
async function typicalHour(org: MeteredOrg, except: string): Promise<number> {
  const values = (await hoursOf(org))
    .filter((h) => h.quality === "measured")
    .filter((h) => h.intervalStart.getTime() !== new Date(except).getTime())
    .map((h) => Math.abs(Number(h.energyKwh)))
    .sort((a, b) => a - b);
  const mid = Math.floor(values.length / 2);
  return values.length % 2 ? values[mid] : (values[mid - 1] + values[mid]) / 2;
}

/** The March rollup of the meter against the exact sum of its hours. */
async function marchRollupAndHours(org: MeteredOrg) {
  const { rows } = await pool.query<{ rollup: string; hours: string }>(
    `select (select energy_kwh::text from monthly_rollups
              where organization_id = $1 and meter_id = $2 and month = '2026-03-01') as rollup,
            (select sum(energy_kwh)::text from intervals
              where organization_id = $1 and meter_id = $2) as hours`,
    [org.org.id, org.meters.water.id],
  );
  return rows[0];
}

const en = (n: number, minimumFractionDigits = 0) =>
  n.toLocaleString("en-GB", {
    minimumFractionDigits,
    maximumFractionDigits: minimumFractionDigits ? 3 : 0,
  });

describe("a correction of the wrong sign for the meter", () => {
  it("is refused on an import meter (−500 kWh) and an export meter (+30 kWh), changing nothing", async () => {
    const { org, manager } = await meteredHeat();
    await post(org, [
      {
        meter: org.meters.export.code,
        quantity: "electric_register",
        time: "2026-03-10T00:00:00Z",
        register_kwh: 500,
      },
      {
        meter: org.meters.export.code,
        quantity: "electric_register",
        time: "2026-03-10T01:00:00Z",
        register_kwh: 540,
      },
    ]);
    const before = await snapshot(org);

    const imported = await correct(manager, org, {
      intervalStart: "2026-03-10T02:00:00Z",
      energyKwh: "-500",
    });
    expect(imported.status).toBe(400);
    const importPage = await imported.text();
    expect(importPage).toContain(
      `${org.meters.water.code} records heat delivered to the site, which the ledger counts as positive kWh (or 0): −500 kWh has the wrong sign.`,
    );
    expect(importPage).toContain("If 500 kWh was delivered, enter 500.");

    const exported = await correct(
      manager,
      org,
      { intervalStart: "2026-03-10T00:00:00Z", energyKwh: "30" },
      org.meters.export.id,
    );
    expect(exported.status).toBe(400);
    expect(await exported.text()).toContain(
      "which the ledger counts as negative kWh (or 0): 30 kWh has the wrong sign. If 30 kWh was exported, enter −30.",
    );
    // Confirming does not make a wrong sign right.
    const confirmed = await correct(manager, org, {
      intervalStart: "2026-03-10T02:00:00Z",
      energyKwh: "-500",
      confirmSpike: "-500",
    });
    expect(confirmed.status).toBe(400);
    expect(await snapshot(org)).toEqual(before);

    // The right sign goes through on both.
    expect(
      (
        await correct(
          manager,
          org,
          { intervalStart: "2026-03-10T00:00:00Z", energyKwh: "-30" },
          org.meters.export.id,
        )
      ).status,
    ).toBe(200);
    const [exportHour] = await hoursOf(org, org.meters.export.id);
    expect([exportHour.quality, Number(exportHour.energyKwh)]).toEqual([
      "edited",
      -30,
    ]);
  });
});

describe("a correction far outside the meter's history", () => {
  it("without a confirmation is refused, naming the jump, and changes nothing", async () => {
    const { org, manager } = await meteredHeat();
    const before = await snapshot(org);
    const typical = await typicalHour(org, "2026-03-10T05:00:00Z");

    const response = await correct(manager, org, {
      intervalStart: "2026-03-10T05:00:00Z",
      energyKwh: "1000000000",
    });
    expect(response.status).toBe(400);
    // The panel is drawn in the browser: the answer is in the page's data.
    expect(await response.text()).toContain(
      `1,000,000,000 kWh is ${en(1e9 / typical)} × this meter's typical interval of ${en(typical, 1)} kWh; intervals above 10 × are flagged as spikes.`,
    );

    // A confirmation given for another value does not count for this one.
    const otherValue = await correct(manager, org, {
      intervalStart: "2026-03-10T05:00:00Z",
      energyKwh: "1000000000",
      confirmSpike: "5000",
    });
    expect(otherValue.status).toBe(400);
    expect(await snapshot(org)).toEqual(before);
  });

  it("with the confirmation is stored, flagged, audited with the jump, and its month's rollup stays exact", async () => {
    const { org, manager } = await meteredHeat();
    const typical = await typicalHour(org, "2026-03-10T05:00:00Z");
    const response = await correct(manager, org, {
      intervalStart: "2026-03-10T05:00:00Z",
      energyKwh: "1000000000",
      confirmSpike: "1000000000",
    });
    expect(response.status).toBe(200);

    const hour = (await hoursOf(org)).find(
      (h) => h.intervalStart.toISOString() === "2026-03-10T05:00:00.000Z",
    )!;
    expect([hour.quality, hour.energyKwh, hour.flags]).toEqual([
      "edited",
      "1000000000.000000",
      ["confirmed_spike"],
    ]);
    const { rollup, hours } = await marchRollupAndHours(org);
    expect(rollup).toBe(hours);

    const [audit] = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.action, "interval.edited"),
        ),
      );
    expect(audit.details).toMatchObject({
      to: { energyKwh: "1000000000.000000" },
      reason: "Checked against the register photo",
      confirmedSpike: {
        confirmed: true,
        typicalIntervalKwh: typical.toFixed(6),
        timesTypical: Number((1e9 / typical).toFixed(1)),
        spikeFactor: 10,
      },
    });
  });
});

describe("an ordinary correction", () => {
  it("is stored without a confirmation, and the old value's spike flag goes with the old value", async () => {
    const { org, manager } = await meteredHeat();
    // A real spike from the meter: 200 m³ in an hour, flagged after ingest.
    await post(org, [water(org, "2026-03-10T06", 200)]);
    const flagsAt6 = async () =>
      (await hoursOf(org)).find(
        (h) => h.intervalStart.toISOString() === "2026-03-10T06:00:00.000Z",
      )?.flags;
    await expect.poll(flagsAt6, { timeout: 10_000 }).toEqual(["spike"]);

    const typical = await typicalHour(org, "2026-03-10T06:00:00Z");
    const ordinary = Math.round(typical * 1.1 * 1000) / 1000;
    const response = await correct(manager, org, {
      intervalStart: "2026-03-10T06:00:00Z",
      energyKwh: String(ordinary),
    });
    expect(response.status).toBe(200);
    const hour = (await hoursOf(org)).find(
      (h) => h.intervalStart.toISOString() === "2026-03-10T06:00:00.000Z",
    )!;
    expect([hour.quality, Number(hour.energyKwh), hour.flags]).toEqual([
      "edited",
      ordinary,
      [],
    ]);
    const { rollup, hours } = await marchRollupAndHours(org);
    expect(rollup).toBe(hours);
  });
});
