// The parser pg-boss schedules with (its own dependency).
import cronParser from "cron-parser";
import { describe, expect, it } from "vitest";
import {
  cronEvery,
  periodicSchedules,
  queueNames,
  queueSettings,
} from "./queues";

/** The minutes between the first few runs of a cron expression from 00:00 UTC. */
function gaps(cron: string, runs = 4): number[] {
  const parsed = cronParser.parseExpression(cron, {
    currentDate: new Date("2026-12-01T00:00:00Z"),
    tz: "UTC",
  });
  const times = Array.from({ length: runs }, () =>
    parsed.next().toDate().getTime(),
  );
  return times.slice(1).map((t, i) => (t - times[i]) / 60_000);
}

describe("cronEvery", () => {
  it("runs every n minutes within the hour, and every whole hour above it", () => {
    expect(gaps(cronEvery(1))).toEqual([1, 1, 1]);
    expect(gaps(cronEvery(15))).toEqual([15, 15, 15]);
    expect(gaps(cronEvery(60))).toEqual([60, 60, 60]);
    expect(gaps(cronEvery(120))).toEqual([120, 120, 120]);
    expect(gaps(cronEvery(90))).toEqual([120, 120, 120]);
    expect(gaps(cronEvery(3 * 24 * 60))).toEqual([1440, 1440, 1440]);
  });

  it("refuses a period that is not a whole number of minutes from 1", () => {
    expect(() => cronEvery(0)).toThrow(/cannot be scheduled/);
    expect(() => cronEvery(2.5)).toThrow(/cannot be scheduled/);
  });
});

describe("the queues", () => {
  it("turns a period of 0 into no schedule", () => {
    const schedules = periodicSchedules({
      alertsMinutes: 0,
      reconcileMinutes: 60,
    });
    expect(schedules.find((s) => s.queue === "alerts")?.cron).toBeNull();
    expect(schedules.find((s) => s.queue === "billing-reconcile")?.cron).toBe(
      "0 * * * *",
    );
  });

  it("creates a dead-letter queue before the queue that names it", () => {
    for (const [i, name] of queueNames.entries()) {
      const target = queueSettings[name].deadLetter;
      if (target) expect(queueNames.indexOf(target)).toBeLessThan(i);
    }
  });
});
