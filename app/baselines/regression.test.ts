import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  assessFit,
  avoidedEnergy,
  fitBaseline,
  GUIDELINE_14,
  goodnessOfFit,
  predict,
  monthsFitted,
  ratioEnpis,
  shortBaselineWarning,
  type BaselinePoint,
} from "./regression";

// The check arithmetic of references.md §6 [computed there from the
// ASHRAE Guideline 14 definitions]: twelve months of energy and HDD.
const Y = [1500, 1420, 1300, 1050, 800, 600, 550, 560, 700, 1000, 1250, 1480];
const HDD = [450, 410, 360, 250, 150, 60, 30, 35, 100, 230, 340, 440];
const TWELVE: BaselinePoint[] = Y.map((kwh, i) => ({ dd: HDD[i], kwh }));

/**
 * A second, independent OLS: the closed form from the raw sums (normal
 * equations), b = (nΣxy − ΣxΣy)/(nΣx² − (Σx)²), a = (Σy − bΣx)/n, and
 * R² = 1 − SSE/SST, written out here rather than taken from the library.
 */
function closedFormOls(points: readonly BaselinePoint[]) {
  const n = points.length;
  let sx = 0;
  let sy = 0;
  let sxy = 0;
  let sxx = 0;
  for (const { dd: x, kwh: y } of points) {
    sx += x;
    sy += y;
    sxy += x * y;
    sxx += x * x;
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
  const intercept = (sy - slope * sx) / n;
  const mean = sy / n;
  let sse = 0;
  let sst = 0;
  let bias = 0;
  for (const { dd: x, kwh: y } of points) {
    const r = y - (intercept + slope * x);
    sse += r * r;
    bias += r;
    sst += (y - mean) ** 2;
  }
  return {
    slope,
    intercept,
    r2: 1 - sse / sst,
    cvrmse: (100 * Math.sqrt(sse / (n - 2))) / mean,
    nmbe: (100 * bias) / ((n - 2) * mean),
  };
}

describe("Guideline 14 statistics", () => {
  it("reproduce the check arithmetic for the fixed model ŷ = 500 + 2.2·HDD (divisor n − 2, sign measured − model)", () => {
    // references.md §6: ȳ = 1017.5, Σ(y − ŷ) = −71, Σ(y − ŷ)² = 3541;
    // CV(RMSE) 1.8494 %, NMBE −0.6978 % with the divisor n − 2 = 10.
    const stats = goodnessOfFit(TWELVE, { intercept: 500, slope: 2.2 });
    expect(stats.n).toBe(12);
    expect(stats.p).toBe(2);
    expect(stats.meanKwh).toBe(1017.5);
    expect(stats.cvrmse).toBeCloseTo(1.8494, 4);
    expect(stats.nmbe).toBeCloseTo(-0.6978, 4);
    expect(stats.rmse).toBeCloseTo(Math.sqrt(3541 / 10), 10);
  });

  it("with other divisors give the other rows of the check table", () => {
    // references.md §6: n − 1 → 1.7633 %, −0.6344 %; n → 1.6883 %, −0.5815 %.
    const model = { intercept: 500, slope: 2.2 };
    const n1 = goodnessOfFit(TWELVE, model, 1);
    expect(n1.cvrmse).toBeCloseTo(1.7633, 4);
    expect(n1.nmbe).toBeCloseTo(-0.6344, 4);
    const n0 = goodnessOfFit(TWELVE, model, 0);
    expect(n0.cvrmse).toBeCloseTo(1.6883, 4);
    expect(n0.nmbe).toBeCloseTo(-0.5815, 4);
  });

  it("NMBE is positive when the model under-predicts", () => {
    const points = [
      { dd: 0, kwh: 110 },
      { dd: 1, kwh: 120 },
      { dd: 2, kwh: 130 },
    ];
    const stats = goodnessOfFit(points, { intercept: 100, slope: 10 });
    // Σ(y − ŷ) = 30, (n − p)·ȳ = 1 × 120: +25 %.
    expect(stats.nmbe).toBeCloseTo(25, 12);
  });

  it("holds fits to the Guideline 14 criteria (monthly 15 % / ±5 %, daily 30 % / ±10 %)", () => {
    // references.md §6, "Calibration thresholds" [read].
    expect(GUIDELINE_14.monthly).toEqual({ cvrmse: 15, nmbe: 5 });
    expect(GUIDELINE_14.daily).toEqual({ cvrmse: 30, nmbe: 10 });
    expect(assessFit({ cvrmse: 15, nmbe: -5 }, "monthly")).toEqual({
      cvrmse: { value: 15, limit: 15, pass: true },
      nmbe: { value: -5, limit: 5, pass: true },
    });
    const failing = assessFit({ cvrmse: 15.01, nmbe: 5.2 }, "monthly");
    expect(failing.cvrmse.pass).toBe(false);
    expect(failing.nmbe.pass).toBe(false);
    const daily = assessFit({ cvrmse: 25, nmbe: -8 }, "daily");
    expect(daily.cvrmse.pass && daily.nmbe.pass).toBe(true);
    expect(assessFit({ cvrmse: null, nmbe: null }, "daily").cvrmse.pass).toBe(
      false,
    );
  });
});

describe("ordinary least squares baseline", () => {
  it("matches the check fit a = 471.667, b = 2.294 22 and has NMBE 0 on its own data", () => {
    // references.md §6: "An ordinary least-squares fit with an intercept
    // (a = 471.667, b = 2.294 22) has Σ residuals = 0, so its NMBE on the
    // training data is 0 by construction."
    const fit = fitBaseline(TWELVE);
    if (!fit.ok) throw new Error(fit.reason);
    expect(fit.model.intercept).toBeCloseTo(471.667, 3);
    expect(fit.model.slope).toBeCloseTo(2.29422, 5);
    expect(fit.model.nmbe).toBeCloseTo(0, 10);
  });

  it("agrees with an independent closed-form computation", () => {
    const fit = fitBaseline(TWELVE);
    if (!fit.ok) throw new Error(fit.reason);
    const check = closedFormOls(TWELVE);
    expect(fit.model.slope).toBeCloseTo(check.slope, 10);
    expect(fit.model.intercept).toBeCloseTo(check.intercept, 8);
    expect(fit.model.r2).toBeCloseTo(check.r2, 12);
    expect(fit.model.cvrmse).toBeCloseTo(check.cvrmse, 10);
    expect(fit.model.r2).toBeCloseTo(0.9996, 4);
  });

  it("agrees with the closed form on arbitrary data (property)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            dd: fc.integer({ min: 0, max: 600 }),
            kwh: fc.integer({ min: 1, max: 100_000 }),
          }),
          { minLength: 3, maxLength: 36 },
        ),
        (points) => {
          fc.pre(new Set(points.map((p) => p.dd)).size > 1);
          const fit = fitBaseline(points);
          if (!fit.ok) throw new Error(fit.reason);
          const check = closedFormOls(points);
          const scale = Math.max(...points.map((p) => p.kwh));
          expect(
            Math.abs(fit.model.slope - check.slope) * 600,
          ).toBeLessThanOrEqual(1e-7 * scale);
          expect(
            Math.abs(fit.model.intercept - check.intercept),
          ).toBeLessThanOrEqual(1e-7 * scale);
          if (fit.model.r2 !== null && Number.isFinite(check.r2))
            expect(fit.model.r2).toBeCloseTo(check.r2, 6);
          expect(fit.model.nmbe).toBeCloseTo(0, 6);
        },
      ),
    );
  });

  it("a perfect line gives R² = 1, CV(RMSE) = 0 and NMBE = 0 (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 5000, noNaN: true }),
        fc.double({ min: 0.5, max: 500, noNaN: true }),
        fc.uniqueArray(fc.integer({ min: 0, max: 700 }), {
          minLength: 3,
          maxLength: 24,
        }),
        (intercept, slope, dds) => {
          const points = dds.map((dd) => ({ dd, kwh: intercept + slope * dd }));
          const fit = fitBaseline(points);
          if (!fit.ok) throw new Error(fit.reason);
          expect(fit.model.r2).toBeCloseTo(1, 9);
          expect(fit.model.cvrmse).toBeCloseTo(0, 5);
          expect(fit.model.nmbe).toBeCloseTo(0, 5);
          expect(fit.model.slope).toBeCloseTo(slope, 6);
        },
      ),
    );
  });

  it("scaling the energy scales slope and intercept and leaves R², CV(RMSE) alone (property)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            dd: fc.integer({ min: 0, max: 600 }),
            kwh: fc.integer({ min: 1, max: 50_000 }),
          }),
          { minLength: 3, maxLength: 24 },
        ),
        fc.double({ min: 0.001, max: 1000, noNaN: true }),
        (points, k) => {
          fc.pre(new Set(points.map((p) => p.dd)).size > 1);
          fc.pre(new Set(points.map((p) => p.kwh)).size > 1);
          const a = fitBaseline(points);
          const b = fitBaseline(points.map((p) => ({ ...p, kwh: k * p.kwh })));
          if (!a.ok || !b.ok) throw new Error("fit failed");
          const tolerance = 1e-7 * k * Math.max(...points.map((p) => p.kwh));
          expect(
            Math.abs(b.model.slope - k * a.model.slope) * 600,
          ).toBeLessThanOrEqual(tolerance);
          expect(
            Math.abs(b.model.intercept - k * a.model.intercept),
          ).toBeLessThanOrEqual(tolerance);
          expect(b.model.r2).toBeCloseTo(a.model.r2!, 6);
          expect(b.model.cvrmse).toBeCloseTo(a.model.cvrmse!, 6);
        },
      ),
    );
  });

  it("refuses too few periods or degree days that never change", () => {
    expect(fitBaseline([{ dd: 1, kwh: 2 }]).ok).toBe(false);
    expect(
      fitBaseline([
        { dd: 5, kwh: 1 },
        { dd: 5, kwh: 2 },
        { dd: 5, kwh: 3 },
      ]),
    ).toMatchObject({ ok: false });
    expect(() =>
      goodnessOfFit([{ dd: 1, kwh: 1 }], { slope: 1, intercept: 0 }),
    ).toThrow(RangeError);
  });

  it("has no R² when the energy never changes", () => {
    const fit = fitBaseline([
      { dd: 1, kwh: 7 },
      { dd: 2, kwh: 7 },
      { dd: 3, kwh: 7 },
    ]);
    if (!fit.ok) throw new Error(fit.reason);
    expect(fit.model.r2).toBeNull();
    expect(fit.model.slope).toBe(0);
    expect(fit.model.cvrmse).toBe(0);
  });
});

describe("avoided energy use and EnPIs", () => {
  it("reproduces the worked example: E = 1200 + 2.5·HDD, HDD 300, metered 1700 → +250 kWh", () => {
    // references.md §6, IPMVP "avoided energy use" worked example (common
    // practice): adjusted baseline 1950 kWh.
    const model = { intercept: 1200, slope: 2.5 };
    expect(predict(model, 300)).toBe(1950);
    expect(avoidedEnergy(model, [{ dd: 300, actualKwh: 1700 }])).toEqual({
      adjustedBaselineKwh: 1950,
      reportingKwh: 1700,
      avoidedKwh: 250,
      avoidedPercent: (100 * 250) / 1950,
      periods: 1,
    });
  });

  it("sums several reporting periods, and is negative when more was used", () => {
    const model = { intercept: 100, slope: 2 };
    const result = avoidedEnergy(model, [
      { dd: 10, actualKwh: 150 },
      { dd: 0, actualKwh: 90 },
    ]);
    // Adjusted baseline 120 + 100 = 220; metered 240.
    expect(result.adjustedBaselineKwh).toBe(220);
    expect(result.avoidedKwh).toBe(-20);
    expect(avoidedEnergy(model, [])).toMatchObject({
      avoidedKwh: 0,
      avoidedPercent: null,
      periods: 0,
    });
  });

  it("a reporting period that follows the model exactly avoids nothing (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 5000, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        fc.array(fc.integer({ min: 0, max: 600 }), { maxLength: 24 }),
        (intercept, slope, dds) => {
          const model = { intercept, slope };
          const result = avoidedEnergy(
            model,
            dds.map((dd) => ({ dd, actualKwh: predict(model, dd) })),
          );
          expect(result.avoidedKwh).toBe(0);
        },
      ),
    );
  });

  it("gives energy per degree day and per m², or none without a denominator", () => {
    expect(
      ratioEnpis({ kwh: 12_000, degreeDays: 400, floorAreaM2: 2400 }),
    ).toEqual({ kwhPerDegreeDay: 30, kwhPerM2: 5 });
    expect(ratioEnpis({ kwh: 10, degreeDays: 0, floorAreaM2: null })).toEqual({
      kwhPerDegreeDay: null,
      kwhPerM2: null,
    });
  });
});

describe("baselines shorter than a year", () => {
  const months = (n: number, from = 2025) =>
    Array.from({ length: n }, (_, i) => ({
      month: `${from + Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, "0")}`,
    }));

  it("warns below twelve months, even for a perfect fit", () => {
    // Six months on an exact line: R² = 1, CV(RMSE) and NMBE 0, all pass.
    const points = months(6).map((m, i) => ({
      ...m,
      dd: 50 * i,
      kwh: 200 + 30 * 50 * i,
    }));
    const fit = fitBaseline(points);
    expect(fit.ok && assessFit(fit.model, "monthly").cvrmse.pass).toBe(true);
    expect(shortBaselineWarning(points)).toMatch(
      /^Fitted on 6 months, fewer than the 12 of a full year/,
    );
    expect(shortBaselineWarning(months(11))).toMatch(/^Fitted on 11 months/);
    expect(shortBaselineWarning(months(1))).toMatch(/^Fitted on 1 month,/);
  });

  it("does not warn from twelve months on", () => {
    expect(shortBaselineWarning(months(12))).toBeNull();
    expect(shortBaselineWarning(months(24))).toBeNull();
  });

  it("counts calendar months, not periods: a daily baseline's days group by month", () => {
    const days = Array.from({ length: 90 }, (_, i) => ({
      month: new Date(Date.UTC(2025, 0, 1 + i)).toISOString().slice(0, 10),
    }));
    expect(monthsFitted(days)).toBe(3);
    expect(shortBaselineWarning(days)).toMatch(/^Fitted on 3 months/);
  });
});
