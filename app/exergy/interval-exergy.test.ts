// Exergy of one interval from its heat Q and entropy flow S, Ex = Q − T₀·S.
//
// Check values: IAPWS R7-97(2012), the IF97 release, Table 5 (region 1
// verification values) at p = 3 MPa: T = 300 K, h = 115.331273 kJ/kg,
// s = 0.392294792 kJ/(kg·K); T = 500 K, h = 975.542239 kJ/kg,
// s = 2.58041912 kJ/(kg·K). The expected exergy is worked from those
// printed figures by hand, not from this code's IF97.
import { describe, expect, it } from "vitest";
import { evaluateItem } from "~/physics/evaluate";
import { exergyAt, exergyBasis, readingExergyBasis } from "./interval-exergy";

// 3600 kg, so that kJ/kg read directly as kWh.
const TABLE_5 = {
  massKg: 3600,
  pressureBarAbs: 30,
  flowTempC: 500 - 273.15,
  returnTempC: 300 - 273.15,
  siteSign: 1 as const,
};

describe("exergy of an interval at the day's outdoor mean", () => {
  it("matches IF97 Table 5 worked by hand: 10 °C dead state", () => {
    const basis = exergyBasis(TABLE_5);
    const dh = 975.542239 - 115.331273; // kWh for 3600 kg
    const ds = 2.58041912 - 0.392294792; // kWh/K for 3600 kg
    expect(basis.heatKwh).toBeCloseTo(dh, 5);
    expect(basis.entropyKwhPerK).toBeCloseTo(ds, 7);
    // 860.210966 − 283.15 × 2.188124328 = 240.6435625…
    expect(exergyAt(basis, 10)).toBeCloseTo(240.64356, 4);
    expect(dh - 283.15 * ds).toBeCloseTo(240.64356, 4);
  });

  it("an export meter's exergy leaves the site: the same figure, negative", () => {
    const out = exergyBasis({ ...TABLE_5, siteSign: -1 });
    expect(exergyAt(out, 10)).toBeCloseTo(-240.64356, 4);
  });

  it("agrees with the evaluate API's details.exergy_kwh for chilled water", () => {
    const item = {
      quantity: "water_heat",
      volume_m3: 12.5,
      flow_temp_c: 6,
      return_temp_c: 12,
      pressure_bar_abs: 4,
      sensor_at: "return",
    };
    const plain = evaluateItem(item);
    const withAmbient = evaluateItem({ ...item, ambient_temp_c: 24.5 });
    if (!plain.ok || !withAmbient.ok) throw new Error("evaluate failed");
    // A cooling meter facing into the site: its heat is negative (heat out).
    const basis = readingExergyBasis(item, plain.details, 1)!;
    expect(basis.heatKwh).toBeCloseTo(plain.energy_kwh, 9);
    expect(basis.heatKwh).toBeLessThan(0);
    const exergy = exergyAt(basis, 24.5)!;
    expect(exergy).toBeGreaterThan(0);
    expect(exergy).toBeCloseTo(withAmbient.details.exergy_kwh as number, 9);
  });

  it("gives no figure when the day is on the wrong side of the flow", () => {
    const heating = exergyBasis(TABLE_5);
    expect(exergyAt(heating, 49)).not.toBeNull();
    expect(exergyAt({ ...heating, flowLimitC: 40 }, 40)).toBeNull();
    const chilled = { ...heating, heating: false, flowLimitC: 6 };
    expect(exergyAt(chilled, 6)).toBeNull();
    expect(exergyAt(chilled, 6.5)).not.toBeNull();
  });

  it("has no basis for other quantities or without the details", () => {
    expect(readingExergyBasis({ quantity: "steam_heat" }, {}, 1)).toBeNull();
    expect(
      readingExergyBasis(
        { quantity: "water_heat", flow_temp_c: 70, return_temp_c: 50 },
        {},
        1,
      ),
    ).toBeNull();
  });
});
