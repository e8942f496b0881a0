/**
 * Issue #14, done when: a new organisation, over the JSON API alone, creates
 * a site and a half-hourly meter, posts two days of `interval_energy`
 * readings, and reads back 96 half-hour intervals and a ledger month whose
 * net is their exact sum. Around it: a repeat changes nothing, a late
 * half-hour in a closed month is an adjusting entry, a 15-minute meter's gap
 * is estimated in quarter-hours, and a meter's resolution is fixed once it
 * has data.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { estimationSettled } from "../support/estimation";

afterAll(() => pool.end());

const MINUTE_MS = 60_000;
const HALF_HOUR_MS = 30 * MINUTE_MS;
const FIRST = Date.parse("2026-06-10T00:00:00Z");

type Answer = {
  accepted: number;
  repeats: number;
  rejected: { index: number; reason: string }[];
  conflicts: unknown[];
};
type IntervalPage = {
  meter: { interval_minutes: number };
  intervals: {
    start: string;
    end: string;
    energy_kwh: string;
    quality: string;
    estimate_method: string | null;
  }[];
};
type LedgerRow = {
  month: string;
  status: string;
  net_kwh: string;
  adjustments_kwh: string;
  adjustment_count: number;
};

/** Exact decimal text as micro-kWh, so sums stay exact. */
function micro(text: string): bigint {
  const negative = text.startsWith("-");
  const [whole, fraction = ""] = text.replace("-", "").split(".");
  const value = BigInt(whole + fraction.padEnd(6, "0").slice(0, 6));
  return negative ? -value : value;
}

/** Half-hour i's kWh: distinct, three decimals, so a lost one shows. */
const kwhOf = (i: number) => Math.round((0.8 + i * 0.037) * 1000) / 1000;

function halfHour(code: string, i: number, energy = kwhOf(i), minutes = 30) {
  const start = FIRST + i * HALF_HOUR_MS;
  return {
    meter: code,
    quantity: "interval_energy",
    start: new Date(start).toISOString(),
    end: new Date(start + minutes * MINUTE_MS).toISOString(),
    energy_kwh: energy,
  };
}

describe("a half-hourly meter over the JSON API (issue #14)", () => {
  let owner: Client;
  let orgId: string;
  let siteId: string;
  let meterId: string;
  const code = `HH-${Date.now().toString(36)}`;
  const api = (path: string) => `/api/v1/orgs/${orgId}${path}`;

  const postReadings = async (readings: unknown[]) => {
    const response = await owner.postJson(api("/readings"), { readings });
    expect(response.status).toBe(200);
    return (await response.json()) as Answer;
  };
  const intervals = async (id: string, from: string, to: string) => {
    const response = await owner.get(
      api(`/meters/${id}/intervals?from=${from}&to=${to}`),
    );
    expect(response.status).toBe(200);
    return (await response.json()) as IntervalPage;
  };
  const juneLedger = async () => {
    const response = await owner.get(
      api("/ledger?from=2026-06&to=2026-06&carrier=electricity"),
    );
    expect(response.status).toBe(200);
    const { rows } = (await response.json()) as { rows: LedgerRow[] };
    expect(rows).toHaveLength(1);
    return rows[0];
  };
  const createMeter = async (meterCode: string, minutes: number) => {
    const response = await owner.postJson(api("/meters"), {
      site_id: siteId,
      code: meterCode,
      name: `Supplier kWh ${meterCode}`,
      quantity: "electric_work",
      carrier: "electricity",
      orientation: "import",
      interval_minutes: minutes,
      installed_at: "2026-01-01",
    });
    expect(response.status).toBe(201);
    const meter = (await response.json()) as {
      id: string;
      interval_minutes: number;
    };
    expect(meter.interval_minutes).toBe(minutes);
    return meter.id;
  };

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    const org = await createOrganization(["owner"]);
    orgId = org.id;
    owner = new Client();
    await owner.signIn(org.members[0].email, org.members[0].password);
    const site = await owner.postJson(api("/sites"), {
      name: "Half-hourly site",
      time_zone: "Europe/London",
    });
    expect(site.status).toBe(201);
    siteId = ((await site.json()) as { id: string }).id;
    meterId = await createMeter(code, 30);
  });

  it("takes two days of half-hours and gives back 96 exact intervals and a ledger month of their exact sum", async () => {
    const readings = Array.from({ length: 96 }, (_, i) => halfHour(code, i));
    const answer = await postReadings(readings);
    expect(answer).toMatchObject({ accepted: 96, repeats: 0, rejected: [] });
    expect(answer.conflicts).toEqual([]);

    const page = await intervals(
      meterId,
      "2026-06-10T00:00:00Z",
      "2026-06-12T00:00:00Z",
    );
    expect(page.meter.interval_minutes).toBe(30);
    expect(page.intervals).toHaveLength(96);
    let sum = 0n;
    page.intervals.forEach((interval, i) => {
      expect(Date.parse(interval.start)).toBe(FIRST + i * HALF_HOUR_MS);
      expect(Date.parse(interval.end) - Date.parse(interval.start)).toBe(
        HALF_HOUR_MS,
      );
      expect(interval.quality).toBe("measured");
      expect(micro(interval.energy_kwh)).toBe(micro(kwhOf(i).toFixed(6)));
      sum += micro(kwhOf(i).toFixed(6));
    });
    expect(micro((await juneLedger()).net_kwh)).toBe(sum);
  });

  it("a repeat of the same batch changes nothing", async () => {
    const before = await juneLedger();
    const answer = await postReadings(
      Array.from({ length: 96 }, (_, i) => halfHour(code, i)),
    );
    expect(answer).toMatchObject({ accepted: 0, repeats: 96, rejected: [] });
    expect(await juneLedger()).toEqual(before);
    const page = await intervals(
      meterId,
      "2026-06-10T00:00:00Z",
      "2026-06-12T00:00:00Z",
    );
    expect(page.intervals).toHaveLength(96);
  });

  it("refuses an hour-long reading on a half-hourly meter, with the reason", async () => {
    const answer = await postReadings([halfHour(code, 200, 1, 60)]);
    expect(answer.accepted).toBe(0);
    expect(answer.rejected).toEqual([
      {
        index: 0,
        meter: code,
        reason:
          "end: this meter records 30-minute intervals; the reading covers 60 minutes",
      },
    ]);
  });

  it("a late half-hour in a closed month becomes an adjusting entry", async () => {
    const closed = await owner.post(`/o/${orgId}/ledger`, {
      intent: "close",
      month: "2026-06",
      siteId: "",
    });
    expect(closed.status).toBe(200);
    const before = await juneLedger();
    expect(before.status).toBe("closed");
    // The half-hour right after the two days: no gap, so nothing estimated.
    const answer = await postReadings([halfHour(code, 96, 2.345)]);
    expect(answer.accepted).toBe(1);
    const after = await juneLedger();
    expect(after).toMatchObject({
      status: "closed",
      net_kwh: before.net_kwh,
      adjustments_kwh: "2.345000",
      adjustment_count: 1,
    });
  });

  it("a 15-minute meter's gap is estimated in quarter-hour steps", async () => {
    const quarterCode = `QH-${Date.now().toString(36)}`;
    const quarterId = await createMeter(quarterCode, 15);
    const quarter = (start: string, energy: number) => ({
      meter: quarterCode,
      quantity: "interval_energy",
      start,
      end: new Date(Date.parse(start) + 15 * MINUTE_MS).toISOString(),
      energy_kwh: energy,
    });
    const answer = await postReadings([
      quarter("2026-07-01T00:00:00Z", 1),
      quarter("2026-07-01T01:00:00Z", 5),
    ]);
    expect(answer.accepted).toBe(2);
    await estimationSettled(orgId);
    const page = await intervals(
      quarterId,
      "2026-07-01T00:00:00Z",
      "2026-07-01T02:00:00Z",
    );
    expect(
      page.intervals.map((i) => [
        i.start,
        i.end,
        micro(i.energy_kwh),
        i.quality,
      ]),
    ).toEqual([
      ["2026-07-01T00:00:00Z", "2026-07-01T00:15:00Z", 1_000_000n, "measured"],
      ["2026-07-01T00:15:00Z", "2026-07-01T00:30:00Z", 2_000_000n, "estimated"],
      ["2026-07-01T00:30:00Z", "2026-07-01T00:45:00Z", 3_000_000n, "estimated"],
      ["2026-07-01T00:45:00Z", "2026-07-01T01:00:00Z", 4_000_000n, "estimated"],
      ["2026-07-01T01:00:00Z", "2026-07-01T01:15:00Z", 5_000_000n, "measured"],
    ]);
  });

  it("a half-hourly register meter's reads become half-hours", async () => {
    const registerCode = `HR-${Date.now().toString(36)}`;
    const response = await owner.postJson(api("/meters"), {
      site_id: siteId,
      code: registerCode,
      name: "Half-hourly register",
      quantity: "electric_register",
      carrier: "electricity",
      orientation: "import",
      interval_minutes: 30,
      installed_at: "2026-01-01",
    });
    expect(response.status).toBe(201);
    const registerId = ((await response.json()) as { id: string }).id;
    const read = (time: string, kwh: number) => ({
      meter: registerCode,
      quantity: "electric_register",
      time,
      register_kwh: kwh,
    });
    const answer = await postReadings([
      read("2026-08-03T10:00:00Z", 100),
      read("2026-08-03T10:30:00Z", 101.25),
      read("2026-08-03T11:30:00Z", 104.25),
    ]);
    expect(answer.accepted).toBe(3);
    await estimationSettled(orgId);
    const page = await intervals(
      registerId,
      "2026-08-03T10:00:00Z",
      "2026-08-03T12:00:00Z",
    );
    // One read to the next half-hour is measured; over an hour, the advance
    // is spread evenly over its two half-hours.
    expect(
      page.intervals.map((i) => [i.start, micro(i.energy_kwh), i.quality]),
    ).toEqual([
      ["2026-08-03T10:00:00Z", 1_250_000n, "measured"],
      ["2026-08-03T10:30:00Z", 1_500_000n, "estimated"],
      ["2026-08-03T11:00:00Z", 1_500_000n, "estimated"],
    ]);
  });

  it("a meter's resolution can change before it has data, and not after", async () => {
    const fresh = await createMeter(`NEW-${Date.now().toString(36)}`, 60);
    const changed = await owner.request(api(`/meters/${fresh}`), {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ interval_minutes: 15 }),
    });
    expect(changed.status).toBe(200);
    expect(
      ((await changed.json()) as IntervalPage["meter"]).interval_minutes,
    ).toBe(15);

    const refused = await owner.request(api(`/meters/${meterId}`), {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ interval_minutes: 60 }),
    });
    expect(refused.status).toBe(409);
    const body = (await refused.json()) as {
      error: { code: string; message: string };
    };
    expect(body.error.code).toBe("resolution_fixed");
    expect(body.error.message).toMatch(/already has intervals of 30 minutes/);
    const meter = await owner.get(api(`/meters/${meterId}`));
    expect(
      ((await meter.json()) as { interval_minutes: number }).interval_minutes,
    ).toBe(30);

    const odd = await owner.request(api(`/meters/${fresh}`), {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ interval_minutes: 20 }),
    });
    expect(odd.status).toBe(400);
  });
});
