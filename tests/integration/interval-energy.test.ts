/**
 * `interval_energy` readings end to end over the JSON API: a new
 * organisation's energy manager creates an import and an export meter, a
 * gateway posts two days of hourly kWh, and the intervals and the ledger
 * give back exactly what was sent, signed by each meter's orientation.
 */
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import {
  addCoolingMeter,
  createMeteredOrg,
  type MeteredOrg,
} from "../support/metered-org";

afterAll(() => pool.end());

type Answer = {
  accepted: number;
  repeats: number;
  rejected: { index: number; reason: string; meter?: string }[];
  conflicts: { index: number; reason: string }[];
};
type IntervalAnswer = {
  intervals: {
    start: string;
    end: string;
    energy_kwh: string;
    quality: string;
  }[];
};
type LedgerAnswer = {
  rows: {
    month: string;
    carrier: string;
    imports_kwh: string;
    exports_kwh: string;
    net_kwh: string;
  }[];
};

const HOUR_MS = 3_600_000;
const FIRST_HOUR = Date.parse("2026-06-10T00:00:00Z");

/** Exact decimal text (e.g. "-12.345000") as micro-kWh, so sums stay exact. */
function micro(text: string): bigint {
  const negative = text.startsWith("-");
  const [whole, fraction = ""] = text.replace("-", "").split(".");
  const value = BigInt(whole + fraction.padEnd(6, "0").slice(0, 6));
  return negative ? -value : value;
}

/** Hour i's kWh: distinct, with three decimals, so a lost hour shows. */
const kwhOf = (i: number, base: number) =>
  Math.round((base + i * 0.137) * 1000) / 1000;

function reading(code: string, hour: number, energy: number, minutes = 60) {
  const start = FIRST_HOUR + hour * HOUR_MS;
  return {
    meter: code,
    quantity: "interval_energy",
    start: new Date(start).toISOString(),
    end: new Date(start + minutes * 60_000).toISOString(),
    energy_kwh: energy,
  };
}

describe("interval_energy readings over the API", () => {
  let org: MeteredOrg;
  let manager: Client;
  let importCode: string;
  let exportCode: string;
  const ids: Record<string, string> = {};

  const post = async (readings: unknown[]) => {
    const response = await new Client().postJson(
      "/api/v1/readings",
      { readings },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(response.status).toBe(200);
    return (await response.json()) as Answer;
  };

  async function rawCount(meterId: string) {
    const [row] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.rawReadings)
      .where(
        and(
          eq(schema.rawReadings.organizationId, org.org.id),
          eq(schema.rawReadings.meterId, meterId),
        ),
      );
    return row.n;
  }

  async function createMeter(code: string, orientation: string) {
    const response = await manager.postJson(
      `/api/v1/orgs/${org.org.id}/meters`,
      {
        site_id: org.siteId,
        code,
        name: `Supplier kWh ${code}`,
        quantity: "electric_work",
        carrier: "electricity",
        orientation,
        installed_at: "2026-01-01",
      },
    );
    expect(response.status).toBe(201);
    return ((await response.json()) as { id: string }).id;
  }

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    org = await createMeteredOrg({ roles: ["energy_manager"] });
    manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    importCode = `SI-${org.tag}`;
    exportCode = `SX-${org.tag}`;
    ids[importCode] = await createMeter(importCode, "import");
    ids[exportCode] = await createMeter(exportCode, "export");
  });

  it("stores 48 hours per meter with exact values, imports positive and exports negative, and the ledger month is their exact sum", async () => {
    const readings = [];
    for (let i = 0; i < 48; i++) {
      readings.push(reading(importCode, i, kwhOf(i, 3.5)));
      readings.push(reading(exportCode, i, kwhOf(i, 0.25)));
    }
    const answer = await post(readings);
    expect(answer).toMatchObject({ accepted: 96, repeats: 0, rejected: [] });
    expect(answer.conflicts).toEqual([]);

    let expectedNet = 0n;
    for (const [code, sign] of [
      [importCode, 1n],
      [exportCode, -1n],
    ] as const) {
      const base = code === importCode ? 3.5 : 0.25;
      const response = await manager.get(
        `/api/v1/orgs/${org.org.id}/meters/${ids[code]}/intervals?from=2026-06-10T00:00:00Z&to=2026-06-12T00:00:00Z`,
      );
      expect(response.status).toBe(200);
      const page = (await response.json()) as IntervalAnswer;
      expect(page.intervals).toHaveLength(48);
      page.intervals.forEach((interval, i) => {
        expect(Date.parse(interval.start)).toBe(FIRST_HOUR + i * HOUR_MS);
        expect(interval.quality).toBe("measured");
        const sent = micro(kwhOf(i, base).toFixed(6));
        expect(micro(interval.energy_kwh)).toBe(sign * sent);
        expectedNet += sign * sent;
      });
    }

    const ledger = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger?from=2026-06&to=2026-06&carrier=electricity`,
    );
    expect(ledger.status).toBe(200);
    const { rows } = (await ledger.json()) as LedgerAnswer;
    expect(rows).toHaveLength(1);
    expect(micro(rows[0].net_kwh)).toBe(expectedNet);
    expect(micro(rows[0].exports_kwh)).toBeLessThan(0n);
    expect(micro(rows[0].imports_kwh) + micro(rows[0].exports_kwh)).toBe(
      expectedNet,
    );
  });

  it("refuses negative, misaligned and wrong-length intervals with the reason, storing nothing from them", async () => {
    const before = await rawCount(ids[importCode]);
    const misaligned = reading(importCode, 60, 2);
    misaligned.start = "2026-06-12T12:30:00Z";
    misaligned.end = "2026-06-12T13:30:00Z";
    const answer = await post([
      reading(importCode, 60, -2),
      misaligned,
      reading(importCode, 61, 2, 30),
      reading(importCode, 62, 2, 120),
    ]);
    expect(answer.accepted).toBe(0);
    expect(answer.rejected.map((r) => [r.index, r.reason])).toEqual([
      [
        0,
        "energy_kwh: must not be negative; the sign comes from the meter's orientation (import or export)",
      ],
      [
        1,
        "start: this meter records 60-minute intervals, which start on a multiple of 60 minutes in UTC; the reading starts at 12:30 UTC",
      ],
      [
        2,
        "end: this meter records 60-minute intervals; the reading covers 30 minutes",
      ],
      [
        3,
        "end: this meter records 60-minute intervals; the reading covers 120 minutes",
      ],
    ]);
    expect(await rawCount(ids[importCode])).toBe(before);
  });

  it("a repeat changes nothing; another value for a stored interval is a conflict, kept and not applied", async () => {
    const first = reading(importCode, 0, kwhOf(0, 3.5));
    // The same reading with its keys in another order is a repeat.
    const reordered = {
      energy_kwh: first.energy_kwh,
      end: first.end,
      start: first.start,
      quantity: first.quantity,
      meter: first.meter,
    };
    expect(await post([reordered])).toMatchObject({
      accepted: 0,
      repeats: 1,
      conflicts: [],
    });
    const conflicting = await post([reading(importCode, 0, 99)]);
    expect(conflicting.accepted).toBe(0);
    expect(conflicting.conflicts).toHaveLength(1);
    const kept = await db
      .select()
      .from(schema.readingConflicts)
      .where(eq(schema.readingConflicts.organizationId, org.org.id));
    expect(kept).toHaveLength(1);
    const [hour] = await db
      .select({ energy: schema.intervals.energyKwh })
      .from(schema.intervals)
      .where(
        and(
          eq(schema.intervals.organizationId, org.org.id),
          eq(schema.intervals.meterId, ids[importCode]),
          eq(schema.intervals.intervalStart, new Date(FIRST_HOUR)),
        ),
      );
    expect(micro(String(hour.energy))).toBe(micro(kwhOf(0, 3.5).toFixed(6)));
  });

  it("a cooling meter's kWh take chilled water's sign; register meters refuse interval_energy", async () => {
    const cooling = await addCoolingMeter(org);
    const answer = await post([
      reading(cooling.code, 0, 12.5),
      reading(org.meters.register.code, 0, 4),
    ]);
    expect(answer.accepted).toBe(1);
    expect(answer.rejected).toEqual([
      {
        index: 1,
        meter: org.meters.register.code,
        reason: `quantity: meter ${org.meters.register.code} is a register (electric_register); send its register reads, not interval_energy`,
      },
    ]);
    const [hour] = await db
      .select({ energy: schema.intervals.energyKwh })
      .from(schema.intervals)
      .where(
        and(
          eq(schema.intervals.organizationId, org.org.id),
          eq(schema.intervals.meterId, cooling.id),
        ),
      );
    expect(micro(String(hour.energy))).toBe(-12_500_000n);
    expect(await rawCount(org.meters.register.id)).toBe(0);
  });
});
