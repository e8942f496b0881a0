// The evaluate items of design.md "Fuels, hydrogen and exergy": gas_volume,
// liquid_fuel, hydrogen and water_heat's ambient_temp_c, through the API's
// item path (parse, physics, details), with reasons in the API's field names.

import { describe, expect, it } from "vitest";
import { evaluateItem, evaluateItems, evaluateResultSchema } from "./evaluate";
import type { EvaluateResult } from "./evaluate";
import { gasCorrectionFactor } from "./gas-volume";
import { expectRelativeClose } from "./test-helpers";

function okResult(r: EvaluateResult) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error}`);
  return r;
}

function errorOf(r: EvaluateResult): string {
  if (r.ok) throw new Error(`expected a rejection, got ${r.energy_kwh} kWh`);
  return r.error;
}

const GAS = {
  quantity: "gas_volume",
  volume_m3: 1000,
  calorific_value_mj_m3: 39.2,
} as const;

describe("gas_volume", () => {
  it("corrects from line conditions and reports the factor", () => {
    const r = okResult(
      evaluateItem({ ...GAS, gas_temp_c: 9, gas_pressure_mbar_g: 21 }),
    );
    const factor = gasCorrectionFactor(9, 21, 1013.25);
    expect(r.details.correction_factor).toBe(factor);
    expectRelativeClose(r.energy_kwh, (1000 * factor * 39.2) / 3.6, 1e-12);
    expect(r.details.cv_basis).toBe("gross");
    expect(r.method).toBe("ideal-gas/gas-volume");
  });

  it("reads hundreds of cubic feet as ft³ × 0.028316846592", () => {
    const ft3 = okResult(
      evaluateItem({
        quantity: "gas_volume",
        volume_ft3: 35_314.6667,
        calorific_value_mj_m3: 39.2,
        cv_basis: "net",
      }),
    );
    // 35 314.6667 ft³ is 1000.000 m³ to 1e-9 (1 m³ = 35.314 666 72 ft³).
    expectRelativeClose(ft3.details.volume_m3 as number, 1000, 1e-9);
    expect(ft3.details.cv_basis).toBe("net");
  });

  it("takes a stated correction factor, or none", () => {
    const stated = okResult(
      evaluateItem({ ...GAS, correction_factor: 1.02264 }),
    );
    const none = okResult(evaluateItem(GAS));
    expect(none.details.correction_factor).toBe(1);
    expectRelativeClose(stated.energy_kwh / none.energy_kwh, 1.02264, 1e-12);
  });

  it.each([
    [
      { calorific_value_mj_m3: 65 },
      "calorific_value_mj_m3: 65 MJ/m³ is outside 10 MJ/m³ to 60 MJ/m³",
    ],
    [
      { gas_temp_c: -25, gas_pressure_mbar_g: 21 },
      "gas_temp_c: -25 °C is outside -20 °C to 60 °C",
    ],
    [{ gas_temp_c: 10 }, "gas_pressure_mbar_g: is required with gas_temp_c"],
    [
      { atmospheric_pressure_mbar: 990 },
      "atmospheric_pressure_mbar: needs gas_temp_c and gas_pressure_mbar_g",
    ],
    [{ volume_m3: -3 }, "volume_m3: must be at least 0, got -3"],
    [{ volume_ft3: 100 }, "volume_ft3: give volume_m3 or volume_ft3, not both"],
    [{ correction_factor: 12 }, "correction_factor: 12 is outside"],
    [{ cv_basis: "higher" }, "cv_basis"],
  ])("refuses %o with the field", (patch, reason) => {
    expect(errorOf(evaluateItem({ ...GAS, ...patch }))).toContain(reason);
  });

  it("asks for a volume when none is given", () => {
    const { volume_m3: _v, ...noVolume } = GAS;
    expect(errorOf(evaluateItem(noVolume))).toBe(
      "volume_m3: is required (or volume_ft3)",
    );
  });
});

const OIL = {
  quantity: "liquid_fuel",
  density_kg_l: 0.845,
  calorific_value_mj_kg: 45.6,
} as const;

describe("liquid_fuel", () => {
  it("agrees between a metered volume and the same consumption from stock", () => {
    const metered = okResult(evaluateItem({ ...OIL, volume_l: 2300 }));
    const stock = okResult(
      evaluateItem({
        ...OIL,
        opening_stock_l: 4100,
        deliveries_l: 5000,
        closing_stock_l: 6800,
      }),
    );
    expect(stock.energy_kwh).toBe(metered.energy_kwh);
    expect(stock.details.consumption_from).toBe("stock_balance");
    expect(metered.details.consumption_from).toBe("volume");
    expectRelativeClose(metered.energy_kwh, (2300 * 0.845 * 45.6) / 3.6, 1e-12);
  });

  it("refuses a negative consumption naming the three fields", () => {
    const e = errorOf(
      evaluateItem({
        ...OIL,
        opening_stock_l: 1000,
        deliveries_l: 0,
        closing_stock_l: 1400,
      }),
    );
    expect(e).toContain(
      "opening_stock_l + deliveries_l − closing_stock_l = -400 l",
    );
  });

  it.each([
    [
      { opening_stock_l: 10, closing_stock_l: 5 },
      "deliveries_l: is required with the other stock fields",
    ],
    [
      { volume_l: 10, density_kg_l: 845 },
      "density_kg_l: 845 kg/l is outside 0.5 kg/l to 1.1 kg/l",
    ],
    [
      { volume_l: 10, calorific_value_mj_kg: 70 },
      "calorific_value_mj_kg: 70 MJ/kg is outside 20 MJ/kg to 55 MJ/kg",
    ],
    [{ volume_l: -10 }, "volume_l: must be at least 0"],
    [{}, "volume_l: is required"],
  ])("refuses %o", (patch, reason) => {
    expect(errorOf(evaluateItem({ ...OIL, ...patch }))).toContain(reason);
  });
});

describe("hydrogen", () => {
  it("returns the gross energy and details.max_work_kwh from ΔG", () => {
    const r = okResult(evaluateItem({ quantity: "hydrogen", mass_kg: 10 }));
    // 10 kg: HHV 141.79 MJ/kg, |ΔG| 117.64 MJ/kg (references.md §9).
    expect((r.energy_kwh * 3.6) / 10).toBeCloseTo(141.79, 2);
    expect(((r.details.max_work_kwh as number) * 3.6) / 10).toBeCloseTo(
      117.64,
      2,
    );
    expect(r.details.gibbs_energy_kj_per_mol).toBeCloseTo(-237.14, 3);
    expect(r.details.basis).toBe("gross");
  });

  it("counts a normal volume through the ideal-gas law, net basis on request", () => {
    const r = okResult(
      evaluateItem({ quantity: "hydrogen", volume_nm3: 100, basis: "net" }),
    );
    expect(r.details.amount_mol).toBeCloseTo(4461.5, 0);
    expectRelativeClose(
      r.energy_kwh,
      ((r.details.amount_mol as number) * 241.826) / 3600,
      1e-12,
    );
  });

  it.each([
    [{ mass_kg: -1 }, "mass_kg: must be at least 0"],
    [
      { mass_kg: 1, volume_nm3: 1 },
      "volume_nm3: give mass_kg or volume_nm3, not both",
    ],
    [{}, "mass_kg: is required, or volume_nm3"],
    [{ mass_kg: 1, basis: "lower" }, "basis"],
  ])("refuses %o", (patch, reason) => {
    expect(errorOf(evaluateItem({ quantity: "hydrogen", ...patch }))).toContain(
      reason,
    );
  });
});

const HEATING = {
  quantity: "water_heat",
  volume_m3: 1,
  flow_temp_c: 75,
  return_temp_c: 50,
  pressure_bar_abs: 16,
  sensor_at: "return",
} as const;

describe("water_heat with ambient_temp_c", () => {
  it("adds details.exergy_kwh, positive and below the heat, for heating", () => {
    const r = okResult(evaluateItem({ ...HEATING, ambient_temp_c: 5 }));
    const ex = r.details.exergy_kwh as number;
    // python3-iapws: 4.963370272 kWh per 1000 kg at 75/50 °C, 16 bar a, 5 °C.
    const massKg = r.details.mass_kg as number;
    expectRelativeClose(ex, (4.963370272 * massKg) / 1000, 1e-7);
    expect(ex).toBeGreaterThan(0);
    expect(ex).toBeLessThan(r.energy_kwh);
  });

  it("keeps the energy negative and the exergy positive for chilled water", () => {
    const r = okResult(
      evaluateItem({
        ...HEATING,
        flow_temp_c: 7,
        return_temp_c: 12,
        ambient_temp_c: 25,
      }),
    );
    expect(r.energy_kwh).toBeLessThan(0);
    expect(r.details.exergy_kwh).toBeGreaterThan(0);
  });

  it("leaves the details as before without an ambient", () => {
    const r = okResult(evaluateItem(HEATING));
    expect(r.details).not.toHaveProperty("exergy_kwh");
  });

  it("refuses an ambient above the flow of a heating flow, with the range", () => {
    const lowTemperature = { ...HEATING, flow_temp_c: 40, return_temp_c: 30 };
    expect(
      errorOf(evaluateItem({ ...lowTemperature, ambient_temp_c: 42 })),
    ).toBe(
      "ambient_temp_c: 42 °C is not below the flow temperature 40 °C: for a " +
        "heating flow (flow warmer than return) the ambient must be below the " +
        "flow, -50 °C to under 40 °C",
    );
  });

  it("refuses an ambient outside -50 °C to 50 °C", () => {
    expect(errorOf(evaluateItem({ ...HEATING, ambient_temp_c: 80 }))).toBe(
      "ambient_temp_c: 80 °C is outside -50 °C to 50 °C",
    );
  });
});

it("answers a mixed fuel batch item by item, one refusal leaving the rest", () => {
  const results = evaluateItems([
    GAS,
    { ...OIL, volume_l: 100 },
    { quantity: "hydrogen", mass_kg: 1 },
    { ...GAS, calorific_value_mj_m3: 5 },
    { quantity: "coal_tonnes", mass_kg: 1 },
  ]);
  expect(results.map((r) => r.ok)).toEqual([true, true, true, false, false]);
  for (const r of results)
    expect(evaluateResultSchema.safeParse(r).success).toBe(true);
  expect(errorOf(results[4])).toContain("gas_volume, liquid_fuel, hydrogen");
});

it.each([
  [{ ...GAS, volume_m3: 1e308 }, "volume_m3"],
  [
    { quantity: "gas_volume", volume_ft3: 1e308, calorific_value_mj_m3: 40 },
    "volume_ft3",
  ],
  [
    { ...OIL, opening_stock_l: 1e308, deliveries_l: 1e308, closing_stock_l: 0 },
    "opening_stock_l",
  ],
  [{ quantity: "hydrogen", volume_nm3: 1e308 }, "volume_nm3"],
  [{ ...HEATING, volume_m3: 1e306, ambient_temp_c: 5 }, "volume_m3"],
])(
  "refuses figures that overflow under the item's own field (%o)",
  (item, field) => {
    expect(errorOf(evaluateItem(item))).toMatch(
      new RegExp(`^${field}: .* too large to represent`),
    );
  },
);
