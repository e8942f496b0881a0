import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

const bearer = (org: MeteredOrg) => ({
  authorization: `Bearer ${org.gatewayKey}`,
});
const post = (org: MeteredOrg, body: unknown) =>
  new Client().postJson("/api/v1/readings", body, bearer(org));

type Answer = {
  accepted: number;
  repeats: number;
  rejected: { index: number; reason: string; meter?: string }[];
  conflicts: { index: number; reason: string }[];
};

/** Hourly heating water: 75 °C flow, 50 °C return, 6 bar abs (the meter's default). */
function water(org: MeteredOrg, hour: string, volume = 2) {
  return {
    meter: org.meters.water.code,
    quantity: "water_heat",
    start: `${hour}:00:00Z`,
    end: new Date(
      new Date(`${hour}:00:00Z`).getTime() + 3_600_000,
    ).toISOString(),
    volume_m3: volume,
    flow_temp_c: 75,
    return_temp_c: 50,
  };
}

const register = (code: string, time: string, kwh: number) => ({
  meter: code,
  quantity: "electric_register",
  time,
  register_kwh: kwh,
});

async function intervalsOf(org: MeteredOrg, meterId: string) {
  return db
    .select()
    .from(schema.intervals)
    .where(
      and(
        eq(schema.intervals.organizationId, org.org.id),
        eq(schema.intervals.meterId, meterId),
      ),
    )
    .orderBy(schema.intervals.intervalStart);
}

async function rawCount(org: MeteredOrg) {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(schema.rawReadings)
    .where(eq(schema.rawReadings.organizationId, org.org.id));
  return row.n;
}

describe("POST /api/v1/readings", () => {
  it("stores readings exactly as received and turns them into signed hourly energy", async () => {
    const org = await createMeteredOrg();
    const readings = [
      water(org, "2026-03-02T08"),
      water(org, "2026-03-02T09", 3),
    ];
    const response = await post(org, { readings });
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      accepted: 2,
      repeats: 0,
      rejected: [],
      conflicts: [],
    });
    const [raw] = await db
      .select()
      .from(schema.rawReadings)
      .where(eq(schema.rawReadings.meterId, org.meters.water.id))
      .orderBy(schema.rawReadings.readingTime);
    expect(raw.payload).toEqual(readings[0]);
    const hours = await intervalsOf(org, org.meters.water.id);
    expect(hours.map((h) => h.quality)).toEqual(["measured", "measured"]);
    // 2 m³ at 75/50 °C, 6 bar, sensor in the return: about 2 × 988 kg × 104.9 kJ/kg ≈ 57.6 kWh
    // (IF97 region 1; the pure module's own tests check the properties to the release's digits).
    expect(Number(hours[0].energyKwh)).toBeGreaterThan(57);
    expect(Number(hours[0].energyKwh)).toBeLessThan(58.2);
    expect(Number(hours[1].energyKwh) / Number(hours[0].energyKwh)).toBeCloseTo(
      1.5,
      6,
    );
  });

  it("is idempotent: a repeat changes nothing, a different value is a conflict kept for review", async () => {
    const org = await createMeteredOrg();
    const readings = [water(org, "2026-03-03T08"), water(org, "2026-03-03T09")];
    await post(org, { readings });
    const before = await intervalsOf(org, org.meters.water.id);
    // The same readings with keys in another order are still repeats.
    const reordered = readings.map((r) =>
      Object.fromEntries(Object.entries(r).reverse()),
    );
    const again = (await (
      await post(org, { readings: reordered })
    ).json()) as Answer;
    expect(again).toMatchObject({ accepted: 0, repeats: 2, conflicts: [] });
    const changed = (await (
      await post(org, { readings: [{ ...readings[0], volume_m3: 9 }] })
    ).json()) as Answer;
    expect(changed.accepted).toBe(0);
    expect(changed.conflicts[0].reason).toMatch(/conflict/);
    expect(await rawCount(org)).toBe(2);
    expect(await intervalsOf(org, org.meters.water.id)).toEqual(before);
    const kept = await db
      .select()
      .from(schema.readingConflicts)
      .where(eq(schema.readingConflicts.organizationId, org.org.id));
    expect(kept).toHaveLength(1);
    expect(kept[0].payload).toMatchObject({ volume_m3: 9 });
  });

  it("a duplicate inside one batch is a repeat or a conflict, never stored twice", async () => {
    const org = await createMeteredOrg();
    const r = water(org, "2026-03-04T10");
    const answer = (await (
      await post(org, { readings: [r, r, { ...r, volume_m3: 1 }] })
    ).json()) as Answer;
    expect(answer).toMatchObject({ accepted: 1, repeats: 1 });
    expect(answer.conflicts.map((c) => c.index)).toEqual([2]);
    expect(await rawCount(org)).toBe(1);
  });

  it("rejects bad readings one by one with the field and a reason, storing the good ones", async () => {
    const org = await createMeteredOrg();
    const good = water(org, "2026-03-05T08");
    const answer = (await (
      await post(org, {
        readings: [
          good,
          { ...water(org, "2026-03-05T09"), volume_m3: "2.5" },
          { ...water(org, "2026-03-05T10"), flow_temp_c: "NaN" },
          { ...water(org, "2026-03-05T11"), volume_m3: null },
          { ...water(org, "2026-03-05T12"), meter: "NO-SUCH-METER" },
          {
            ...water(org, "2026-03-05T13"),
            start: "2099-01-01T00:00:00Z",
            end: "2099-01-01T01:00:00Z",
          },
          {
            ...water(org, "2026-03-05T14"),
            start: "1989-12-31T22:00:00Z",
            end: "1989-12-31T23:00:00Z",
          },
          { ...water(org, "2026-03-05T15"), end: "2026-03-05T15:00:00Z" },
          register(org.meters.water.code, "2026-03-05T16:00:00Z", 5),
          "not an object",
          { ...water(org, "2026-03-05T17"), colour: "blue" },
          { ...water(org, "2026-03-05T18"), volume_m3: -1 },
        ],
      })
    ).json()) as Answer;
    expect(answer.accepted).toBe(1);
    const reasons = Object.fromEntries(
      answer.rejected.map((r) => [r.index, r.reason]),
    );
    expect(Object.keys(reasons).map(Number)).toEqual([
      1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11,
    ]);
    expect(reasons[1]).toMatch(/volume_m3/);
    expect(reasons[2]).toMatch(/flow_temp_c/);
    expect(reasons[3]).toMatch(/volume_m3/);
    expect(reasons[4]).toMatch(/no meter NO-SUCH-METER/);
    expect(reasons[5]).toMatch(/future/);
    expect(reasons[6]).toMatch(/1990/);
    expect(reasons[7]).toMatch(/end: must be after start/);
    expect(reasons[8]).toMatch(/measures water_heat/);
    expect(reasons[9]).toMatch(/JSON object/);
    expect(reasons[10]).toMatch(/colour/);
    expect(reasons[11]).toMatch(/volume_m3/);
    expect(await rawCount(org)).toBe(1);
  });

  it("a key never reaches another organisation's meters: same answer as an unknown meter", async () => {
    const a = await createMeteredOrg();
    const b = await createMeteredOrg();
    const answer = (await (
      await post(a, { readings: [water(b, "2026-03-06T08")] })
    ).json()) as Answer;
    expect(answer.accepted).toBe(0);
    expect(answer.rejected[0].reason).toBe(
      `meter: no meter ${b.meters.water.code} in this organisation`,
    );
    expect(await rawCount(b)).toBe(0);
  });

  it("refuses revoked and unknown keys, malformed JSON, NaN, a wrong envelope and oversized batches", async () => {
    const org = await createMeteredOrg();
    const client = new Client();
    await db
      .update(schema.gateways)
      .set({ revokedAt: new Date() })
      .where(eq(schema.gateways.id, org.gatewayId));
    expect(
      (await post(org, { readings: [water(org, "2026-03-07T08")] })).status,
    ).toBe(401);
    expect(
      (
        await client.postJson(
          "/api/v1/readings",
          { readings: [] },
          { authorization: "Bearer jbgw_nope" },
        )
      ).status,
    ).toBe(401);
    expect(
      (await client.postJson("/api/v1/readings", { readings: [] })).status,
    ).toBe(401);

    const live = await createMeteredOrg();
    const malformed = await post(live, '{"readings": [');
    expect(malformed.status).toBe(400);
    expect(await malformed.json()).toMatchObject({
      error: { code: "invalid_json" },
    });
    expect(
      (await post(live, '{"readings": [{"meter": "x", "volume_m3": NaN}]}'))
        .status,
    ).toBe(400);
    expect((await post(live, { readings: "all of them" })).status).toBe(400);
    expect((await post(live, { readings: [], extra: true })).status).toBe(400);
    const tooMany = await post(live, {
      readings: Array.from({ length: 5001 }, (_, i) => ({
        ...water(live, "2026-03-07T08"),
        volume_m3: i,
      })),
    });
    expect(tooMany.status).toBe(413);
    const tooBig = await post(live, {
      readings: [
        { ...water(live, "2026-03-07T08"), note: "x".repeat(5_300_000) },
      ],
    });
    expect(tooBig.status).toBe(413);
    expect(await rawCount(live)).toBe(0);
  });

  it("differences registers: a roll-over is flagged and counted, a drop is flagged and never negative", async () => {
    const org = await createMeteredOrg();
    const code = org.meters.register.code;
    const answer = (await (
      await post(org, {
        readings: [
          register(code, "2026-04-01T00:00:00Z", 99_990),
          register(code, "2026-04-01T01:00:00Z", 99_998),
          register(code, "2026-04-01T02:00:00Z", 6), // wraps at 100,000: 8 kWh
          register(code, "2026-04-01T03:00:00Z", 16),
          register(code, "2026-04-01T04:00:00Z", 2), // a drop: swap or fault
        ],
      })
    ).json()) as Answer;
    expect(answer.accepted).toBe(5);
    const hours = await intervalsOf(org, org.meters.register.id);
    expect(hours.map((h) => Number(h.energyKwh))).toEqual([8, 8, 10, 0]);
    expect(hours[1].flags).toContain("rollover");
    expect(hours[3].flags).toContain("register_drop");
    expect(hours.every((h) => Number(h.energyKwh) >= 0)).toBe(true);
  });

  it("a late register read between two others splits their delta correctly", async () => {
    const org = await createMeteredOrg();
    const code = org.meters.register.code;
    await post(org, {
      readings: [
        register(code, "2026-04-02T00:00:00Z", 100),
        register(code, "2026-04-02T03:00:00Z", 130),
      ],
    });
    let hours = await intervalsOf(org, org.meters.register.id);
    expect(hours.map((h) => [Number(h.energyKwh), h.quality])).toEqual([
      [10, "estimated"],
      [10, "estimated"],
      [10, "estimated"],
    ]);
    await post(org, {
      readings: [
        register(code, "2026-04-02T01:00:00Z", 104),
        register(code, "2026-04-02T02:00:00Z", 120),
      ],
    });
    hours = await intervalsOf(org, org.meters.register.id);
    expect(hours.map((h) => [Number(h.energyKwh), h.quality])).toEqual([
      [4, "measured"],
      [16, "measured"],
      [10, "measured"],
    ]);
  });

  it("an export meter's energy is negative: it leaves the site", async () => {
    const org = await createMeteredOrg();
    const code = org.meters.export.code;
    await post(org, {
      readings: [
        register(code, "2026-06-01T11:00:00Z", 500),
        register(code, "2026-06-01T12:00:00Z", 540),
      ],
    });
    const hours = await intervalsOf(org, org.meters.export.id);
    expect(hours.map((h) => Number(h.energyKwh))).toEqual([-40]);
  });

  it("estimates a gap, marks it, and replaces the estimate when the late reading arrives", async () => {
    const org = await createMeteredOrg();
    const hoursPosted = ["00", "01", "02", "06", "07", "08"].map((h) =>
      water(org, `2026-05-04T${h}`),
    );
    await post(org, { readings: hoursPosted });
    const estimated = async () =>
      (await intervalsOf(org, org.meters.water.id))
        .filter((h) => h.quality === "estimated")
        .map((h) => h.intervalStart.toISOString());
    await expect
      .poll(estimated, { timeout: 10_000 })
      .toEqual([
        "2026-05-04T03:00:00.000Z",
        "2026-05-04T04:00:00.000Z",
        "2026-05-04T05:00:00.000Z",
      ]);
    const byHour = await intervalsOf(org, org.meters.water.id);
    const gapHour = byHour.find(
      (h) => h.intervalStart.toISOString() === "2026-05-04T04:00:00.000Z",
    )!;
    expect(gapHour.estimateMethod).toBe("linear");
    await post(org, { readings: [water(org, "2026-05-04T04", 1)] });
    const after = (await intervalsOf(org, org.meters.water.id)).find(
      (h) => h.intervalStart.toISOString() === "2026-05-04T04:00:00.000Z",
    )!;
    expect(after.quality).toBe("measured");
    expect(Number(after.energyKwh)).toBeCloseTo(
      Number(byHour[0].energyKwh) / 2,
      5,
    );
  });

  it("limits each gateway's rate with 429 and Retry-After", async () => {
    const org = await createMeteredOrg();
    let limited: Response | null = null;
    for (let i = 0; i < 200 && !limited; i++) {
      const response = await post(org, { readings: [] });
      if (response.status === 429) limited = response;
    }
    expect(limited).not.toBeNull();
    expect(Number(limited!.headers.get("retry-after"))).toBeGreaterThan(0);
    // Another gateway is not slowed by this one.
    const other = await createMeteredOrg();
    expect(
      (await post(other, { readings: [water(other, "2026-03-08T08")] })).status,
    ).toBe(200);
  });
});

describe("intervals and uploads for signed-in people", () => {
  it("members read a meter's intervals; another organisation gets 404; auditors cannot upload", async () => {
    const org = await createMeteredOrg({ roles: ["owner", "auditor"] });
    await post(org, { readings: [water(org, "2026-03-09T08")] });
    const auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    const path = `/api/v1/orgs/${org.org.id}/meters/${org.meters.water.id}/intervals?from=2026-03-09T00:00:00Z&to=2026-03-10T00:00:00Z`;
    const page = (await (await auditor.get(path)).json()) as {
      intervals: { quality: string }[];
    };
    expect(page.intervals).toHaveLength(1);
    const upload = await auditor.postJson(
      `/api/v1/orgs/${org.org.id}/readings`,
      { readings: [water(org, "2026-03-09T09")] },
    );
    expect(upload.status).toBe(403);

    const stranger = await createMeteredOrg();
    const outsider = new Client();
    await outsider.signIn(
      stranger.org.members[0].email,
      stranger.org.members[0].password,
    );
    expect((await outsider.get(path)).status).toBe(404);
    expect(
      (
        await outsider.get(
          `/api/v1/orgs/${stranger.org.id}/meters/${org.meters.water.id}/intervals`,
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await outsider.postJson(`/api/v1/orgs/${org.org.id}/readings`, {
          readings: [water(org, "2026-03-09T10")],
        })
      ).status,
    ).toBe(404);
    expect(await rawCount(org)).toBe(1);
  });

  it("an energy manager uploads CSV rows through the same checks", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    const response = await manager.postJson(
      `/api/v1/orgs/${org.org.id}/readings`,
      {
        readings: [
          water(org, "2026-03-10T08"),
          { ...water(org, "2026-03-10T09"), return_temp_c: "warm" },
        ],
      },
    );
    expect(await response.json()).toMatchObject({
      accepted: 1,
      rejected: [{ index: 1 }],
    });
  });

  it("a correction needs a reason and is written to the audit log", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager", "auditor"],
    });
    await post(org, { readings: [water(org, "2026-03-11T08")] });
    const manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    const pagePath = `/o/${org.org.id}/meters/${org.meters.water.id}/readings`;
    const noReason = await manager.post(pagePath, {
      intent: "edit",
      intervalStart: "2026-03-11T08:00:00Z",
      energyKwh: "50",
      reason: "",
    });
    expect(noReason.status).toBe(400);
    const saved = await manager.post(pagePath, {
      intent: "edit",
      intervalStart: "2026-03-11T08:00:00Z",
      energyKwh: "50",
      reason: "Meter cover open, value checked on site",
    });
    expect(saved.status).toBe(200);
    const [hour] = await intervalsOf(org, org.meters.water.id);
    expect([hour.quality, Number(hour.energyKwh)]).toEqual(["edited", 50]);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.action, "interval.edited"),
        ),
      );
    expect(audit[0].details).toMatchObject({
      reason: "Meter cover open, value checked on site",
      to: { energyKwh: "50.000000" },
    });

    const auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    const refused = await auditor.post(pagePath, {
      intent: "edit",
      intervalStart: "2026-03-11T08:00:00Z",
      energyKwh: "1",
      reason: "auditors may not edit",
    });
    expect(refused.status).toBe(403);
    // A late reading for an edited hour does not overwrite the person's value.
    await post(org, {
      readings: [
        {
          ...water(org, "2026-03-11T08"),
          start: "2026-03-11T08:30:00Z",
          end: "2026-03-11T08:45:00Z",
        },
      ],
    });
    const [after] = await intervalsOf(org, org.meters.water.id);
    expect([after.quality, Number(after.energyKwh)]).toEqual(["edited", 50]);
    expect(after.flags).toContain("late_data_after_edit");
  });
});
