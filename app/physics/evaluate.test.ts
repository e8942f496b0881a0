// The evaluate item logic: parsing each item on its own, the physics behind
// each quantity, and plain reasons with the field path for bad items.

import { describe, expect, it } from "vitest";
import {
  evaluateItem,
  evaluateItems,
  evaluateRequestSchema,
  evaluateResultSchema,
} from "./evaluate";
import type { EvaluateResult } from "./evaluate";

function okResult(r: EvaluateResult) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error}`);
  return r;
}

function errorOf(r: EvaluateResult): string {
  if (r.ok) throw new Error("expected a rejection");
  return r.error;
}

// References.md §3 worked energy: 1 m³, 75/50 °C, 16 bar a, sensor in return.
const WATER_75_50 = {
  quantity: "water_heat",
  volume_m3: 1,
  flow_temp_c: 75,
  return_temp_c: 50,
  pressure_bar_abs: 16,
  sensor_at: "return",
} as const;

describe("evaluateItems on a mixed batch", () => {
  const batch: unknown[] = [
    WATER_75_50,
    { quantity: "steam_heat", mass_kg: 1000, pressure_bar_g: 7 },
    { quantity: "water_heat", volume_m3: "2.41", flow_temp_c: 71.5 },
    {
      quantity: "sensible_heat",
      mass_kg: 900,
      specific_heat_kj_per_kg_k: 3.6,
      inlet_temp_c: 80,
      outlet_temp_c: 60,
    },
    {
      quantity: "electric_work",
      circuit: "dc",
      volts: 24,
      amps: 2.5,
      seconds: 28800,
    },
  ];
  const results = evaluateItems(batch);

  it("answers one result per item, in item order", () => {
    expect(results).toHaveLength(5);
    expect(results.map((r) => r.ok)).toEqual([true, true, false, true, true]);
    for (const r of results)
      expect(evaluateResultSchema.safeParse(r).success).toBe(true);
  });

  it("computes the good items around the bad one", () => {
    // references.md §3 [computed, IF97]: 28.7074 kWh, 103.347 MJ.
    expect(okResult(results[0]!).energy_kwh).toBeCloseTo(28.7074, 4);
    expect(okResult(results[0]!).energy_mj).toBeCloseTo(103.347, 3);
    // references.md §8 [computed, IF97]: 2047 MJ = 568.6 kWh.
    expect(okResult(results[1]!).energy_mj).toBeCloseTo(2047.05, 2);
    // Plain arithmetic: 900 × 3.6 × 20 = 64 800 kJ = 18 kWh.
    expect(okResult(results[3]!).energy_kwh).toBeCloseTo(18, 12);
    // references.md §4 [computed]: 0.48 kWh = 1.728 MJ.
    expect(okResult(results[4]!).energy_mj).toBeCloseTo(1.728, 12);
  });

  it("explains the bad item with its field paths", () => {
    const error = errorOf(results[2]!);
    expect(error).toContain(
      "volume_m3: expected a finite number, got a string",
    );
    expect(error).toContain("return_temp_c: is required");
    expect(error).toContain("sensor_at");
  });
});

describe("strict parsing", () => {
  it("rejects numbers sent as strings", () => {
    const r = evaluateItem({ ...WATER_75_50, flow_temp_c: "75" });
    expect(errorOf(r)).toBe(
      "flow_temp_c: expected a finite number, got a string",
    );
  });

  it("rejects NaN and Infinity", () => {
    expect(
      errorOf(evaluateItem({ ...WATER_75_50, volume_m3: Number.NaN })),
    ).toBe("volume_m3: expected a finite number, got NaN");
    expect(
      errorOf(evaluateItem({ ...WATER_75_50, volume_m3: Infinity })),
    ).toMatch(/volume_m3: expected a finite number, got Infinity/);
  });

  it("rejects unknown fields, including `meter`", () => {
    expect(errorOf(evaluateItem({ ...WATER_75_50, meter: "HX-101" }))).toBe(
      "meter: unknown field",
    );
    expect(errorOf(evaluateItem({ ...WATER_75_50, power_factor: 1 }))).toMatch(
      /power_factor: unknown field/,
    );
  });

  it("rejects an unknown quantity and a non-object item", () => {
    expect(errorOf(evaluateItem({ quantity: "coal_mass" }))).toMatch(
      /^quantity: must be one of water_heat, steam_heat/,
    );
    expect(errorOf(evaluateItem(null))).toMatch(/^item: .*expected object/);
    expect(errorOf(evaluateItem(42))).toMatch(/^item: /);
  });

  it("rejects a negative volume in the schema", () => {
    expect(errorOf(evaluateItem({ ...WATER_75_50, volume_m3: -1 }))).toMatch(
      /^volume_m3: /,
    );
  });
});

describe("water_heat items", () => {
  it("accepts gauge pressure: 14.98675 bar g is 16 bar a", () => {
    const { pressure_bar_abs: _p, ...rest } = WATER_75_50;
    const r = okResult(evaluateItem({ ...rest, pressure_bar_g: 16 - 1.01325 }));
    expect(r.energy_kwh).toBeCloseTo(28.7074, 4);
    expect(r.details.pressure_bar_abs).toBeCloseTo(16, 12);
  });

  it("gives the intermediate values in details", () => {
    const r = okResult(evaluateItem(WATER_75_50));
    expect(r.method).toBe("iapws-if97/water-heat");
    // references.md §3 [computed, IF97]: ρ 988.698 kg/m³, k 1.148 30.
    expect(r.details.density_at_sensor_kg_per_m3).toBeCloseTo(988.698, 3);
    expect(r.details.k_factor_kwh_per_m3_k).toBeCloseTo(1.1483, 5);
    expect(typeof r.details.flow_enthalpy_kj_per_kg).toBe("number");
  });

  it("gives chilled water a negative energy", () => {
    // references.md §3 [computed, IF97]: 7/12 °C, 1 m³, return: −5.8215 kWh.
    const r = okResult(
      evaluateItem({ ...WATER_75_50, flow_temp_c: 7, return_temp_c: 12 }),
    );
    expect(r.energy_kwh).toBeCloseTo(-5.8215, 4);
  });

  it("needs exactly one pressure and a sensor position", () => {
    const { pressure_bar_abs: _p, ...none } = WATER_75_50;
    expect(errorOf(evaluateItem(none))).toMatch(
      /^pressure_bar_abs: is required/,
    );
    expect(
      errorOf(evaluateItem({ ...WATER_75_50, pressure_bar_g: 15 })),
    ).toMatch(
      /^pressure_bar_g: give pressure_bar_abs or pressure_bar_g, not both/,
    );
    const { sensor_at: _s, ...noSensor } = WATER_75_50;
    expect(errorOf(evaluateItem(noSensor))).toMatch(/^sensor_at: /);
  });

  it("reports range and phase errors under the API field name", () => {
    const { pressure_bar_abs: _p, ...rest } = WATER_75_50;
    expect(errorOf(evaluateItem({ ...rest, pressure_bar_g: 45 }))).toMatch(
      /^pressure_bar_g: .*outside the meter range 0\.006 bar a to 40 bar a/,
    );
    expect(
      errorOf(
        evaluateItem({ ...WATER_75_50, pressure_bar_abs: 2, flow_temp_c: 130 }),
      ),
    ).toMatch(/^flow_temp_c: 130 °C is not liquid/);
  });

  it("adds the EN 1434 MPE band when the meter class is given", () => {
    // references.md §3: class 2, Δθmin 3 K, Δθ 20 K, qp 1.5, q 0.6 → ±3.65 %.
    const r = okResult(
      evaluateItem({
        ...WATER_75_50,
        flow_temp_c: 70,
        return_temp_c: 50,
        meter_class: 2,
        delta_theta_min_k: 3,
        qp_m3_per_h: 1.5,
        flow_m3_per_h: 0.6,
      }),
    );
    expect(r.details.en1434_mpe_percent).toBeCloseTo(3.65, 12);
    expect(r.details.energy_kwh_low).toBeCloseTo(
      r.energy_kwh * (1 - 0.0365),
      9,
    );
    expect(r.details.energy_kwh_high).toBeCloseTo(
      r.energy_kwh * (1 + 0.0365),
      9,
    );
  });

  it("derives the flow rate for the MPE from volume and duration", () => {
    // 0.6 m³ in 3600 s is 0.6 m³/h: the same ±3.65 % as above.
    const r = okResult(
      evaluateItem({
        ...WATER_75_50,
        volume_m3: 0.6,
        flow_temp_c: 70,
        return_temp_c: 50,
        start: "2026-03-01T00:00:00Z",
        end: "2026-03-01T01:00:00Z",
        meter_class: 2,
        delta_theta_min_k: 3,
        qp_m3_per_h: 1.5,
      }),
    );
    expect(r.details.en1434_flow_m3_per_h).toBeCloseTo(0.6, 12);
    expect(r.details.en1434_mpe_percent).toBeCloseTo(3.65, 12);
  });

  it("leaves the MPE out, with the reason, below Δθmin", () => {
    const r = okResult(
      evaluateItem({
        ...WATER_75_50,
        flow_temp_c: 52,
        return_temp_c: 50,
        meter_class: 2,
        delta_theta_min_k: 3,
        qp_m3_per_h: 1.5,
        flow_m3_per_h: 0.6,
      }),
    );
    expect(r.details.en1434_mpe_percent).toBeNull();
    expect(r.details.en1434_mpe_note).toMatch(/Δθmin/);
  });

  it("rejects incomplete MPE fields", () => {
    expect(errorOf(evaluateItem({ ...WATER_75_50, meter_class: 2 }))).toMatch(
      /^delta_theta_min_k: is required with meter_class/,
    );
    expect(errorOf(evaluateItem({ ...WATER_75_50, qp_m3_per_h: 1.5 }))).toMatch(
      /^qp_m3_per_h: needs meter_class/,
    );
    expect(
      errorOf(
        evaluateItem({
          ...WATER_75_50,
          meter_class: 1,
          delta_theta_min_k: 3,
          qp_m3_per_h: 1.5,
        }),
      ),
    ).toMatch(/^flow_m3_per_h: is required with meter_class/);
  });
});

describe("steam_heat items and the phase rule", () => {
  it("rejects a pressure and a saturation temperature that disagree", () => {
    // 7 bar g saturates at 170.48 °C; 164.95 °C is 7 bar a (references.md §2).
    const r = evaluateItem({
      quantity: "steam_heat",
      mass_kg: 180,
      pressure_bar_g: 7,
      saturation_temp_c: 164.95,
    });
    expect(errorOf(r)).toMatch(/^saturation_temp_c: .*Gibbs phase rule/);
    expect(errorOf(r)).toMatch(/the gauge pressure gives/);
  });

  it("accepts them when they agree and reports h_fg", () => {
    const r = okResult(
      evaluateItem({
        quantity: "steam_heat",
        mass_kg: 1000,
        pressure_bar_g: 7,
        saturation_temp_c: 170.5,
      }),
    );
    // references.md §2 [computed, IF97]: h_fg(7 bar g) = 2047.05 kJ/kg.
    expect(r.details.h_fg_kj_per_kg).toBeCloseTo(2047.05, 2);
    expect(r.energy_kwh).toBeCloseTo(568.6, 1);
    expect(r.method).toBe("iapws-if97/steam-condensing");
  });

  it("rejects condensate hotter than saturation and a missing state", () => {
    const hot = evaluateItem({
      quantity: "steam_heat",
      mass_kg: 1,
      pressure_bar_g: 7,
      condensate_temp_c: 180,
    });
    expect(errorOf(hot)).toMatch(/^condensate_temp_c: .*hotter/);
    expect(
      errorOf(evaluateItem({ quantity: "steam_heat", mass_kg: 1 })),
    ).toMatch(/^no steam state given/);
  });
});

describe("steam_heat edges: the range and saturation", () => {
  const steam = (fields: Record<string, number>) =>
    evaluateItem({ quantity: "steam_heat", mass_kg: 1, ...fields });

  it("accepts the same range whichever field names the state", () => {
    // 40 bar a is T_s = 250.36 °C (IAPWS-IF97 region 4, Eq. 31 [computed]);
    // 250.3 °C is p_s = 39.96 bar a.
    const byPressure = okResult(steam({ pressure_bar_abs: 40 }));
    expect(byPressure.details.saturation_temp_c).toBeCloseTo(250.3575, 4);
    const byTemperature = okResult(steam({ saturation_temp_c: 250.3 }));
    expect(byTemperature.details.pressure_bar_abs).toBeCloseTo(39.9612, 4);
    const byGauge = okResult(steam({ pressure_bar_g: 40 - 1.01325 }));
    expect(byGauge.energy_kwh).toBeCloseTo(byPressure.energy_kwh, 9);
    expect(errorOf(steam({ saturation_temp_c: 250.4 }))).toMatch(
      /^saturation_temp_c: 250\.4 °C is outside the saturation range 0 °C to 250\.36 °C/,
    );
    expect(errorOf(steam({ pressure_bar_abs: 40.01 }))).toMatch(
      /^pressure_bar_abs: 40\.01 bar a is outside/,
    );
  });

  it("labels condensate exactly at saturation saturated liquid", () => {
    const r = okResult(
      steam({ saturation_temp_c: 180, condensate_temp_c: 180 }),
    );
    expect(r.details.condensate).toBe("saturated_liquid");
    expect(r.details.condensate_enthalpy_kj_per_kg).toBe(
      r.details.h_f_kj_per_kg,
    );
    const top = okResult(
      steam({
        pressure_bar_abs: 40,
        condensate_temp_c: byTopSaturation(),
      }),
    );
    expect(top.details.condensate).toBe("saturated_liquid");
  });
});

// T_s(40 bar a) as the API reports it, fed back as a condensate temperature.
function byTopSaturation(): number {
  const r = okResult(
    evaluateItem({ quantity: "steam_heat", mass_kg: 1, pressure_bar_abs: 40 }),
  );
  return r.details.saturation_temp_c as number;
}

describe("an energy too large to represent", () => {
  const overflowing: [string, Record<string, unknown>, string][] = [
    [
      "water heat",
      {
        ...WATER_75_50,
        volume_m3: 1e306,
        meter_class: 2,
        delta_theta_min_k: 3,
        qp_m3_per_h: 1.5,
        seconds: 3600,
      },
      "volume_m3",
    ],
    [
      "steam",
      { quantity: "steam_heat", mass_kg: 1e306, pressure_bar_g: 7 },
      "mass_kg",
    ],
    [
      "sensible heat",
      {
        quantity: "sensible_heat",
        mass_kg: 1e308,
        specific_heat_kj_per_kg_k: 10,
        inlet_temp_c: 100,
        outlet_temp_c: 0,
      },
      "mass_kg",
    ],
    [
      "electrical work",
      {
        quantity: "electric_work",
        circuit: "dc",
        volts: 1e200,
        amps: 1e150,
        seconds: 1,
      },
      "volts",
    ],
    [
      "a register (in MJ only)",
      {
        quantity: "electric_register",
        register_start_kwh: 0,
        register_end_kwh: 1e308,
        multiplier: 1.5,
      },
      "register_end_kwh",
    ],
    [
      "a register multiplier",
      {
        quantity: "heat_register",
        register_start_kwh: 0,
        register_end_kwh: 10,
        multiplier: 1e308,
      },
      "multiplier",
    ],
  ];

  for (const [name, item, field] of overflowing) {
    it(`names the item's own field for ${name}, not \`value\``, () => {
      const r = evaluateItem(item);
      expect(errorOf(r)).toMatch(
        new RegExp(`^${field}: .*too large to represent`),
      );
      expect(evaluateResultSchema.safeParse(r).success).toBe(true);
    });
  }

  it("never answers ok with a figure JSON cannot carry", () => {
    for (const [, item] of overflowing) {
      const r = evaluateItem(item);
      const json = JSON.parse(JSON.stringify(r)) as EvaluateResult;
      expect(json).toEqual(r);
    }
  });
});

describe("electric_work items", () => {
  const threePhase = {
    quantity: "electric_work",
    circuit: "three_phase",
    volts: 400,
    voltage_basis: "line_to_line",
    amps: 31.5,
    power_factor: 0.93,
  } as const;

  it("takes the duration from start and end", () => {
    const r = okResult(
      evaluateItem({
        ...threePhase,
        start: "2026-03-01T00:00:00Z",
        end: "2026-03-01T01:00:00Z",
      }),
    );
    // √3 × 400 V × 31.5 A × 0.93 × 1 h [computed].
    expect(r.energy_kwh).toBeCloseTo(
      (Math.sqrt(3) * 400 * 31.5 * 0.93) / 1000,
      9,
    );
    expect(r.method).toBe("electric/three-phase");
  });

  it("rejects a missing or inconsistent duration", () => {
    expect(errorOf(evaluateItem(threePhase))).toMatch(/^seconds: is required/);
    expect(
      errorOf(
        evaluateItem({
          ...threePhase,
          seconds: 60,
          start: "2026-03-01T00:00:00Z",
          end: "2026-03-01T01:00:00Z",
        }),
      ),
    ).toMatch(/^seconds: 60 s disagrees with end − start = 3600 s/);
    expect(
      errorOf(
        evaluateItem({
          ...threePhase,
          start: "2026-03-01T01:00:00Z",
          end: "2026-03-01T00:00:00Z",
        }),
      ),
    ).toMatch(/^end: must be after start/);
    expect(
      errorOf(evaluateItem({ ...threePhase, start: "2026-03-01T01:00:00Z" })),
    ).toMatch(/^end: /);
  });

  it("rejects a power factor outside (0, 1] and pf on DC", () => {
    expect(
      errorOf(evaluateItem({ ...threePhase, seconds: 1, power_factor: 1.2 })),
    ).toMatch(/^power_factor: /);
    expect(
      errorOf(
        evaluateItem({
          quantity: "electric_work",
          circuit: "dc",
          volts: 24,
          amps: 1,
          seconds: 1,
          power_factor: 0.9,
        }),
      ),
    ).toMatch(/^power_factor: applies to AC circuits only/);
  });
});

describe("register items", () => {
  it("reads a roll-over and applies the multiplier", () => {
    const r = okResult(
      evaluateItem({
        quantity: "electric_register",
        register_start_kwh: 99990,
        register_end_kwh: 5,
        register_capacity_kwh: 100000,
        multiplier: 40,
      }),
    );
    expect(r.energy_kwh).toBe(600);
    expect(r.details.register_kind).toBe("rollover");
    expect(r.energy_mj).toBeCloseTo(2160, 9);
  });

  it("flags a drop that is not a roll-over as register_drop, never negative", () => {
    const r = evaluateItem({
      quantity: "heat_register",
      register_start_kwh: 48213.7,
      register_end_kwh: 12,
      register_capacity_kwh: 100000,
    });
    expect(errorOf(r)).toMatch(
      /^register_end_kwh: register_drop: register fell/,
    );
  });

  it("rejects reads at the capacity under the API field name", () => {
    const r = evaluateItem({
      quantity: "electric_register",
      register_start_kwh: 100000,
      register_end_kwh: 5,
      register_capacity_kwh: 100000,
    });
    expect(errorOf(r)).toMatch(/^register_start_kwh: /);
  });
});

describe("evaluateRequestSchema", () => {
  it("accepts 1 to 10 000 items of any shape (items are parsed one by one)", () => {
    expect(
      evaluateRequestSchema.safeParse({ items: [1, "x", null] }).success,
    ).toBe(true);
    expect(evaluateRequestSchema.safeParse({ items: [] }).success).toBe(false);
    const tooMany = { items: Array.from({ length: 10001 }, () => ({})) };
    expect(evaluateRequestSchema.safeParse(tooMany).success).toBe(false);
  });

  it("rejects a missing items array and unknown top-level fields", () => {
    expect(evaluateRequestSchema.safeParse({}).success).toBe(false);
    expect(
      evaluateRequestSchema.safeParse({ items: [{}], readings: [] }).success,
    ).toBe(false);
  });
});
