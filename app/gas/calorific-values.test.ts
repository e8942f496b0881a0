import { describe, expect, it } from "vitest";
import {
  calorificValueInputSchema,
  cubicMetresPerUnit,
  CUBIC_METRES_PER_HCF,
  cvLookup,
  parseCvCsv,
  parseCvPeriod,
  type CvEntry,
} from "./calorific-values";
import {
  localDay,
  priceByDay,
  registerVolumeM3,
  settingsCorrection,
  volumePieces,
  NO_GAS_SETTINGS,
} from "./gas-intervals";
import { priceSeriesGasReading } from "./prepare-gas";

const month = (start: string, cvMjM3: number): CvEntry => ({
  kind: "month",
  start,
  cvMjM3,
  basis: "gross",
});
const day = (start: string, cvMjM3: number): CvEntry => ({
  kind: "day",
  start,
  cvMjM3,
  basis: "gross",
});

describe("hundreds of cubic feet", () => {
  it("is 100 international cubic feet: 2.8316846592 m³ exactly", () => {
    // (0.3048 m)³ × 100 = 3048³ × 100 × 1e-12 m³ = 28316846592 × 1e-10 m³,
    // worked in integers so no rounding enters the check.
    expect(3048n ** 3n * 100n).toBe(28316846592n * 10n ** 2n);
    expect(CUBIC_METRES_PER_HCF).toBe(2.8316846592);
    expect(cubicMetresPerUnit("hcf")).toBe(2.8316846592);
    expect(cubicMetresPerUnit("m3")).toBe(1);
  });

  it("turns a register advance into m³ at reference conditions with the meter's correction", () => {
    const settings = { ...NO_GAS_SETTINGS, registerUnit: "hcf" as const };
    expect(registerVolumeM3(10, settings)).toBeCloseTo(28.316846592, 12);
    const corrected = { ...settings, correctionFactor: 1.02 };
    expect(registerVolumeM3(10, corrected)).toBeCloseTo(
      28.316846592 * 1.02,
      12,
    );
    // 15 °C at 1013.25 mbar absolute is the reference itself.
    const atReference = { ...settings, gasTempC: 15, gasPressureMbarG: 0 };
    expect(settingsCorrection(atReference)).toBeCloseTo(1, 15);
  });
});

describe("the CV in effect on a day", () => {
  const lookup = cvLookup([
    month("2026-03-01", 39.2),
    day("2026-03-15", 38.6),
    month("2026-04-01", 39.8),
  ]);

  it("takes the day's own value over its month's", () => {
    expect(lookup("2026-03-15")?.cvMjM3).toBe(38.6);
    expect(lookup("2026-03-14")?.cvMjM3).toBe(39.2);
    expect(lookup("2026-03-16")?.cvMjM3).toBe(39.2);
    expect(lookup("2026-04-30")?.cvMjM3).toBe(39.8);
  });

  it("has none outside the series", () => {
    expect(lookup("2026-02-28")).toBeNull();
    expect(lookup("2026-05-01")).toBeNull();
  });

  it("reads periods as months or real days only", () => {
    expect(parseCvPeriod("2026-03")).toEqual({
      kind: "month",
      start: "2026-03-01",
    });
    expect(parseCvPeriod("2026-03-15")).toEqual({
      kind: "day",
      start: "2026-03-15",
    });
    expect(parseCvPeriod("2026-02-30")).toBeNull();
    expect(parseCvPeriod("2026-13")).toBeNull();
    expect(parseCvPeriod("March")).toBeNull();
  });

  it("prices each interval at its site-local day's CV, across midnight", () => {
    // 22:00–02:00 UTC on 14/15 March in London (GMT): two hours each side.
    const pieces = priceByDay(
      volumePieces(
        new Date("2026-03-14T22:00:00Z"),
        new Date("2026-03-15T02:00:00Z"),
        40,
        3_600_000,
      ),
      { timeZone: "Europe/London", lookup },
    );
    expect(pieces.map((p) => p.cvMjM3)).toEqual([39.2, 39.2, 38.6, 38.6]);
    expect(pieces[0].energyKwh).toBeCloseTo((10 * 39.2) / 3.6, 12);
    expect(pieces[3].energyKwh).toBeCloseTo((10 * 38.6) / 3.6, 12);
  });

  it("uses the site's local day, not UTC's", () => {
    // 23:30 UTC on 31 May is 1 June in London (BST).
    expect(localDay(new Date("2026-05-31T23:30:00Z"), "Europe/London")).toBe(
      "2026-06-01",
    );
  });

  it("refuses a reading on a day without a CV, naming the day", () => {
    const outcome = priceSeriesGasReading({
      item: { quantity: "gas_volume", volume_m3: 5 },
      meterCode: "G-1",
      start: new Date("2026-05-01T10:00:00Z"),
      end: new Date("2026-05-01T11:00:00Z"),
      stepMs: 3_600_000,
      context: { timeZone: "Europe/London", lookup, settings: NO_GAS_SETTINGS },
    });
    expect(outcome).toEqual({
      ok: false,
      reason: expect.stringContaining("no calorific value for 2026-05-01"),
    });
  });
});

describe("a CV entry", () => {
  it("refuses a value outside 10–60 MJ/m³, naming the field and the range", () => {
    for (const cv of [65, 9.99, 1000]) {
      const r = calorificValueInputSchema.safeParse({
        period: "2026-03",
        calorific_value_mj_m3: cv,
      });
      expect(r.success).toBe(false);
      expect(r.error!.issues[0].message).toMatch(
        /^calorific_value_mj_m3: must be 10 to 60 MJ\/m³/,
      );
    }
  });

  it("reads a CSV of period, cv, basis, and refuses a file with a bad row whole", () => {
    const good = parseCvCsv(
      "period,cv,basis\n2026-01,39.1,gross\n2026-01-10,38.7,net\n",
    );
    expect(good).toEqual({
      ok: true,
      entries: [
        { period: "2026-01", calorific_value_mj_m3: 39.1, basis: "gross" },
        { period: "2026-01-10", calorific_value_mj_m3: 38.7, basis: "net" },
      ],
    });
    const bad = parseCvCsv(
      "period,cv,basis\n2026-01,39.1,gross\n2026-02,65,gross\n",
    );
    expect(bad).toEqual({
      ok: false,
      errors: [
        expect.stringMatching(
          /^Line 3: calorific_value_mj_m3: must be 10 to 60/,
        ),
      ],
    });
    expect(parseCvCsv("month,cv\n2026-01,39")).toMatchObject({ ok: false });
  });
});
