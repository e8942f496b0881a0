// POST /api/v1/energy/evaluate against the running server: per-item
// validation (one bad item fails alone, with the field named), request-level
// errors, and the physics checked at values with a named source.
//
// Sources of the numbers asserted below (references.md):
// - §3, worked energies at 16 bar a, V = 1 m³ [computed, IF97]
// - §2, steam at typical gauge pressures [computed, IF97]
// - §1, IF97 Table 36, T_s(1 MPa) = 453.035 632 K [read]
// - §4, 24 V × 2.5 A × 8 h = 0.48 kWh [computed]; P = √3·V_LL·I·cos φ
//   (textbook; common practice)

import { describe, expect, it } from "vitest";
import {
  electricRegisterItemSchema,
  electricWorkItemSchema,
  gasVolumeItemSchema,
  heatRegisterItemSchema,
  hydrogenItemSchema,
  liquidFuelItemSchema,
  sensibleHeatItemSchema,
  steamHeatItemSchema,
  waterHeatItemSchema,
} from "../../app/physics/evaluate-schema";
import { Client } from "../support/http";

const DEMO_KEY =
  process.env.DEMO_GATEWAY_KEY || "jbgw_demo_larchmere_development_only_key";
const EVALUATE = "/api/v1/energy/evaluate";

type Details = Record<string, number | string | null>;
type Result =
  | {
      ok: true;
      energy_kwh: number;
      energy_mj: number;
      method: string;
      details: Details;
    }
  | { ok: false; error: string };

interface ErrorBody {
  error: {
    code: string;
    message: string;
    issues?: { path: string; message: string }[];
  };
}

type Item = Record<string, unknown>;

function post(body: unknown): Promise<Response> {
  return new Client().postJson(EVALUATE, body, {
    authorization: `Bearer ${DEMO_KEY}`,
  });
}

async function evaluate(items: unknown[]): Promise<Result[]> {
  const response = await post({ items });
  expect(response.status).toBe(200);
  const { results } = (await response.json()) as { results: Result[] };
  expect(results).toHaveLength(items.length);
  return results;
}

async function evaluateOne(item: unknown): Promise<Result> {
  return (await evaluate([item]))[0];
}

function okOf(r: Result) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error}`);
  return r;
}

function errorOf(r: Result): string {
  if (r.ok) throw new Error(`expected a rejection, got ${r.energy_kwh} kWh`);
  return r.error;
}

async function requestError(response: Response, status: number) {
  expect(response.status).toBe(status);
  expect(response.headers.get("content-type")).toMatch(/application\/json/);
  return (await response.json()) as ErrorBody;
}

function without(item: Item, field: string): Item {
  const { [field]: _dropped, ...rest } = item;
  return rest;
}

// One valid item per quantity, the first item of every batch below.
const WATER: Item = {
  quantity: "water_heat",
  volume_m3: 1,
  flow_temp_c: 75,
  return_temp_c: 50,
  pressure_bar_abs: 16,
  sensor_at: "return",
};
const STEAM: Item = {
  quantity: "steam_heat",
  mass_kg: 1000,
  pressure_bar_g: 7,
};
const SENSIBLE: Item = {
  quantity: "sensible_heat",
  mass_kg: 900,
  specific_heat_kj_per_kg_k: 3.6,
  inlet_temp_c: 80,
  outlet_temp_c: 60,
};
const ELECTRIC: Item = {
  quantity: "electric_work",
  circuit: "dc",
  volts: 24,
  amps: 2.5,
  seconds: 28_800,
};
const ELECTRIC_REGISTER: Item = {
  quantity: "electric_register",
  register_start_kwh: 48_000,
  register_end_kwh: 48_200,
};
const HEAT_REGISTER: Item = { ...ELECTRIC_REGISTER, quantity: "heat_register" };
const GAS: Item = {
  quantity: "gas_volume",
  volume_m3: 1000,
  calorific_value_mj_m3: 39.2,
};
const OIL: Item = {
  quantity: "liquid_fuel",
  volume_l: 1000,
  density_kg_l: 0.845,
  calorific_value_mj_kg: 45.6,
};
const HYDROGEN: Item = { quantity: "hydrogen", mass_kg: 10 };

const INTERVAL = {
  start: "2026-03-01T00:00:00Z",
  end: "2026-03-01T01:00:00Z",
  seconds: 3600,
};

interface QuantityCase {
  valid: Item;
  // A valid value for every field the schema knows, to derive a wrong type.
  allFields: Item;
  schemaKeys: string[];
  // Each required field, and what its absence must say.
  required: Record<string, RegExp>;
}

const named = (field: string) => new RegExp(`(^|; )${field}: `);

const QUANTITY_CASES: Record<string, QuantityCase> = {
  water_heat: {
    valid: WATER,
    allFields: {
      ...WATER,
      ...INTERVAL,
      pressure_bar_g: 15,
      meter_class: 2,
      delta_theta_min_k: 3,
      flow_m3_per_h: 1,
      qp_m3_per_h: 1.5,
      ambient_temp_c: 5,
    },
    schemaKeys: Object.keys(waterHeatItemSchema.shape),
    required: {
      quantity: named("quantity"),
      volume_m3: named("volume_m3"),
      flow_temp_c: named("flow_temp_c"),
      return_temp_c: named("return_temp_c"),
      // One of the two pressures is required; the answer names both.
      pressure_bar_abs: /^pressure_bar_abs: is required \(or pressure_bar_g\)$/,
      sensor_at: named("sensor_at"),
    },
  },
  steam_heat: {
    valid: STEAM,
    allFields: {
      ...STEAM,
      ...INTERVAL,
      pressure_bar_abs: 8.01325,
      saturation_temp_c: 170.5,
      condensate_temp_c: 95,
    },
    schemaKeys: Object.keys(steamHeatItemSchema.shape),
    required: {
      quantity: named("quantity"),
      mass_kg: named("mass_kg"),
      // The state can come from any of three fields, so the reason names
      // what is missing rather than one field.
      pressure_bar_g: /no steam state given.*pressure.*saturation temperature/,
    },
  },
  sensible_heat: {
    valid: SENSIBLE,
    allFields: { ...SENSIBLE, ...INTERVAL },
    schemaKeys: Object.keys(sensibleHeatItemSchema.shape),
    required: {
      quantity: named("quantity"),
      mass_kg: named("mass_kg"),
      specific_heat_kj_per_kg_k: named("specific_heat_kj_per_kg_k"),
      inlet_temp_c: named("inlet_temp_c"),
      outlet_temp_c: named("outlet_temp_c"),
    },
  },
  electric_work: {
    valid: ELECTRIC,
    allFields: {
      ...ELECTRIC,
      ...INTERVAL,
      circuit: "three_phase",
      voltage_basis: "line_to_line",
      power_factor: 0.93,
    },
    schemaKeys: Object.keys(electricWorkItemSchema.shape),
    required: {
      quantity: named("quantity"),
      circuit: named("circuit"),
      volts: named("volts"),
      amps: named("amps"),
      seconds: /^seconds: is required \(or start and end\)$/,
    },
  },
  electric_register: {
    valid: ELECTRIC_REGISTER,
    allFields: {
      ...ELECTRIC_REGISTER,
      start: INTERVAL.start,
      end: INTERVAL.end,
      multiplier: 40,
      register_capacity_kwh: 100_000,
    },
    schemaKeys: Object.keys(electricRegisterItemSchema.shape),
    required: {
      quantity: named("quantity"),
      register_start_kwh: named("register_start_kwh"),
      register_end_kwh: named("register_end_kwh"),
    },
  },
  heat_register: {
    valid: HEAT_REGISTER,
    allFields: {
      ...HEAT_REGISTER,
      start: INTERVAL.start,
      end: INTERVAL.end,
      multiplier: 40,
      register_capacity_kwh: 100_000,
    },
    schemaKeys: Object.keys(heatRegisterItemSchema.shape),
    required: {
      quantity: named("quantity"),
      register_start_kwh: named("register_start_kwh"),
      register_end_kwh: named("register_end_kwh"),
    },
  },
  gas_volume: {
    valid: GAS,
    allFields: {
      ...GAS,
      ...INTERVAL,
      volume_ft3: 35_000,
      cv_basis: "gross",
      correction_factor: 1.02264,
      gas_temp_c: 10,
      gas_pressure_mbar_g: 21,
      atmospheric_pressure_mbar: 1005,
    },
    schemaKeys: Object.keys(gasVolumeItemSchema.shape),
    required: {
      quantity: named("quantity"),
      volume_m3: /^volume_m3: is required \(or volume_ft3\)$/,
      calorific_value_mj_m3: named("calorific_value_mj_m3"),
    },
  },
  liquid_fuel: {
    valid: OIL,
    allFields: {
      ...OIL,
      ...INTERVAL,
      opening_stock_l: 5000,
      deliveries_l: 2000,
      closing_stock_l: 6000,
      cv_basis: "net",
    },
    schemaKeys: Object.keys(liquidFuelItemSchema.shape),
    required: {
      quantity: named("quantity"),
      volume_l:
        /^volume_l: is required, or opening_stock_l, deliveries_l and closing_stock_l$/,
      density_kg_l: named("density_kg_l"),
      calorific_value_mj_kg: named("calorific_value_mj_kg"),
    },
  },
  hydrogen: {
    valid: HYDROGEN,
    allFields: { ...HYDROGEN, ...INTERVAL, volume_nm3: 100, basis: "net" },
    schemaKeys: Object.keys(hydrogenItemSchema.shape),
    required: {
      quantity: named("quantity"),
      mass_kg: /^mass_kg: is required, or volume_nm3$/,
    },
  },
};

// A value of the wrong JSON type: numbers arrive as strings, strings
// (enums, date-times, the quantity) as numbers.
function mistyped(value: unknown): unknown {
  return typeof value === "number" ? String(value) : 42;
}

describe("POST /api/v1/energy/evaluate: each field of each quantity", () => {
  for (const [quantity, c] of Object.entries(QUANTITY_CASES)) {
    describe(quantity, () => {
      it("the test knows every field of the schema", () => {
        expect(Object.keys(c.allFields).sort()).toEqual(
          [...c.schemaKeys].sort(),
        );
      });

      it("a missing required field fails that item alone, naming the field", async () => {
        const fields = Object.keys(c.required);
        const results = await evaluate([
          c.valid,
          ...fields.map((f) => without(c.valid, f)),
          c.valid,
        ]);
        okOf(results[0]);
        okOf(results[results.length - 1]);
        fields.forEach((field, i) => {
          expect(errorOf(results[i + 1])).toMatch(c.required[field]);
        });
      });

      it("a mistyped field fails that item alone, naming the field", async () => {
        const fields = Object.keys(c.allFields);
        const results = await evaluate([
          c.valid,
          ...fields.map((f) => ({ ...c.valid, [f]: mistyped(c.allFields[f]) })),
          c.valid,
        ]);
        okOf(results[0]);
        okOf(results[results.length - 1]);
        fields.forEach((field, i) => {
          expect(errorOf(results[i + 1]), field).toMatch(named(field));
        });
      });
    });
  }
});

describe("POST /api/v1/energy/evaluate: numbers that are not numbers", () => {
  const waterText = JSON.stringify({ items: [WATER] });

  for (const literal of ["NaN", "Infinity", "-Infinity"]) {
    it(`${literal} written into the JSON text is invalid JSON: 400 invalid_json`, async () => {
      const text = waterText.replace('"volume_m3":1', `"volume_m3":${literal}`);
      expect(text).toContain(literal);
      const body = await requestError(await post(text), 400);
      expect(body.error.code).toBe("invalid_json");
    });
  }

  it("1e999 is valid JSON but parses to Infinity: that item is rejected", async () => {
    const text = JSON.stringify({ items: [WATER, WATER] }).replace(
      '"volume_m3":1',
      '"volume_m3":1e999',
    );
    const response = await post(text);
    expect(response.status).toBe(200);
    const { results } = (await response.json()) as { results: Result[] };
    expect(errorOf(results[0])).toBe(
      "volume_m3: expected a finite number, got Infinity",
    );
    okOf(results[1]);
  });

  it('"NaN", "Infinity" and numbers as strings are rejected per item', async () => {
    const results = await evaluate([
      { ...WATER, volume_m3: "NaN" },
      { ...WATER, flow_temp_c: "Infinity" },
      { ...WATER, return_temp_c: "50" },
      { ...SENSIBLE, mass_kg: "900" },
      { ...ELECTRIC, volts: "24 V" },
      { ...WATER, volume_m3: null },
      WATER,
    ]);
    expect(results.map((r) => (r.ok ? "ok" : r.error))).toEqual([
      "volume_m3: expected a finite number, got a string",
      "flow_temp_c: expected a finite number, got a string",
      "return_temp_c: expected a finite number, got a string",
      "mass_kg: expected a finite number, got a string",
      "volts: expected a finite number, got a string",
      "volume_m3: expected a finite number, got null",
      "ok",
    ]);
  });

  it("a negative volume or mass is rejected, naming the field and the value", async () => {
    const results = await evaluate([
      { ...WATER, volume_m3: -1 },
      { ...STEAM, mass_kg: -5 },
      { ...SENSIBLE, mass_kg: -900 },
      WATER,
    ]);
    expect(errorOf(results[0])).toMatch(/^volume_m3: .*-1/);
    expect(errorOf(results[1])).toMatch(/^mass_kg: .*-5/);
    expect(errorOf(results[2])).toMatch(/^mass_kg: .*-900/);
    okOf(results[3]);
  });
});

describe("POST /api/v1/energy/evaluate: item shape", () => {
  it("an unknown field is rejected by name, including readings' `meter`", async () => {
    const results = await evaluate([
      { ...WATER, colour: "blue" },
      { ...STEAM, meter: "ST-7" },
      WATER,
    ]);
    expect(errorOf(results[0])).toBe("colour: unknown field");
    expect(errorOf(results[1])).toBe("meter: unknown field");
    okOf(results[2]);
  });

  it("an unknown quantity, or an item that is not an object, fails alone", async () => {
    const results = await evaluate([
      { ...WATER, quantity: "coal_mass" },
      "water_heat",
      null,
      42,
      [WATER],
      WATER,
    ]);
    expect(errorOf(results[0])).toMatch(/^quantity: must be one of water_heat/);
    for (const r of results.slice(1, 5)) {
      expect(errorOf(r)).toMatch(/^item: .*expected object/);
    }
    okOf(results[5]);
  });

  it("absolute and gauge pressure together are refused for water", async () => {
    const r = await evaluateOne({ ...WATER, pressure_bar_g: 15 });
    expect(errorOf(r)).toBe(
      "pressure_bar_g: give pressure_bar_abs or pressure_bar_g, not both",
    );
  });
});

describe("POST /api/v1/energy/evaluate: physics with named sources", () => {
  it("hot water, 1 m³, 75/50 °C, 16 bar a, sensor in the return: 28.7074 kWh (references.md §3)", async () => {
    const r = okOf(await evaluateOne(WATER));
    expect(r.method).toBe("iapws-if97/water-heat");
    expect(r.energy_kwh).toBeCloseTo(28.7074, 4);
    expect(r.energy_mj).toBeCloseTo(103.347, 3);
    expect(r.details.density_at_sensor_kg_per_m3).toBeCloseTo(988.698, 3);
  });

  it("the same with the sensor in the flow pipe: 28.3248 kWh, ρ 975.520 kg/m³ (references.md §3)", async () => {
    const r = okOf(await evaluateOne({ ...WATER, sensor_at: "flow" }));
    expect(r.energy_kwh).toBeCloseTo(28.3248, 4);
    expect(r.details.density_at_sensor_kg_per_m3).toBeCloseTo(975.52, 3);
  });

  it("chilled water, 7/12 °C, comes out negative: −5.8215 kWh (references.md §3)", async () => {
    const r = okOf(
      await evaluateOne({ ...WATER, flow_temp_c: 7, return_temp_c: 12 }),
    );
    expect(r.energy_kwh).toBeLessThan(0);
    expect(r.energy_kwh).toBeCloseTo(-5.8215, 4);
  });

  it("1000 kg of 7 bar g steam condensed to saturated liquid: 2047 MJ = 568.6 kWh (references.md §2, §8)", async () => {
    const r = okOf(await evaluateOne(STEAM));
    expect(r.energy_mj).toBeCloseTo(2047.05, 2);
    expect(r.energy_kwh).toBeCloseTo(568.6, 1);
    expect(r.details.pressure_bar_abs).toBeCloseTo(8.01325, 10);
    expect(r.details.saturation_temp_c).toBeCloseTo(170.482, 3);
    expect(r.details.h_fg_kj_per_kg).toBeCloseTo(2047.05, 2);
    expect(r.details.condensate).toBe("saturated_liquid");
  });

  it("sensible heat: 900 kg × 3.6 kJ/(kg·K) × 20 K = 64 800 kJ = 18 kWh (arithmetic)", async () => {
    const r = okOf(await evaluateOne(SENSIBLE));
    expect(r.energy_kwh).toBeCloseTo(18, 12);
    expect(r.energy_mj).toBeCloseTo(64.8, 12);
  });

  it("DC: 24 V × 2.5 A × 8 h = 1.728 MJ = 0.48 kWh (references.md §4)", async () => {
    const r = okOf(await evaluateOne(ELECTRIC));
    expect(r.energy_kwh).toBeCloseTo(0.48, 12);
    expect(r.energy_mj).toBeCloseTo(1.728, 12);
  });

  it("three-phase, 400 V line to line, 31.5 A, cos φ 0.93, 1 h: √3·V·I·cos φ·t (common practice)", async () => {
    const r = okOf(
      await evaluateOne({
        quantity: "electric_work",
        circuit: "three_phase",
        volts: 400,
        amps: 31.5,
        power_factor: 0.93,
        ...INTERVAL,
      }),
    );
    // √3 × 400 × 31.5 × 0.93 = 20 296.17 W for one hour.
    expect(r.details.active_power_w).toBeCloseTo(20_296.17, 2);
    expect(r.energy_kwh).toBeCloseTo(20.2962, 4);
    expect(r.details.voltage_basis).toBe("line_to_line");
  });
});

// Sources (references.md §9): the ideal-gas law [computed]; CODATA key values
// and HHV 141.79, |ΔG| 117.64 MJ/kg [computed there]; python3-iapws for the
// exergy (app/physics/water-exergy.test.ts gives the script).
describe("POST /api/v1/energy/evaluate: fuels, hydrogen and exergy", () => {
  it("answers each new quantity, and a refused item alone in the batch", async () => {
    const [
      gas,
      gasFt3,
      oil,
      stock,
      hydrogen,
      heating,
      chilled,
      badCv,
      badStock,
      badAmbient,
      coldGas,
    ] = await evaluate([
      {
        ...GAS,
        gas_temp_c: 9,
        gas_pressure_mbar_g: 21,
        atmospheric_pressure_mbar: 1000,
      },
      { ...without(GAS, "volume_m3"), volume_ft3: 10_000, cv_basis: "net" },
      OIL,
      {
        ...without(OIL, "volume_l"),
        opening_stock_l: 4100,
        deliveries_l: 5000,
        closing_stock_l: 8100,
      },
      HYDROGEN,
      { ...WATER, ambient_temp_c: 5 },
      { ...WATER, flow_temp_c: 7, return_temp_c: 12, ambient_temp_c: 25 },
      { ...GAS, calorific_value_mj_m3: 61 },
      {
        ...without(OIL, "volume_l"),
        opening_stock_l: 1000,
        deliveries_l: 0,
        closing_stock_l: 1200,
      },
      { ...WATER, ambient_temp_c: 76 },
      { ...GAS, gas_temp_c: -21, gas_pressure_mbar_g: 21 },
    ]);
    // Ideal gas: n = pV/(RT) at 9 °C and 1021 mbar, back to 15 °C, 1013.25 mbar.
    const moles = (102_100 * 1000) / (8.314462618 * 282.15);
    const vRef = (moles * 8.314462618 * 288.15) / 101_325;
    expect(okOf(gas).energy_kwh).toBeCloseTo((vRef * 39.2) / 3.6, 6);
    expect(okOf(gas).details.correction_factor).toBeCloseTo(vRef / 1000, 12);
    expect(okOf(gasFt3).details.volume_m3).toBeCloseTo(283.16846592, 9);
    expect(okOf(gasFt3).details.cv_basis).toBe("net");
    expect(okOf(oil).energy_kwh).toBeCloseTo((845 * 45.6) / 3.6, 6);
    expect(okOf(stock).energy_kwh).toBe(okOf(oil).energy_kwh);
    expect((okOf(hydrogen).energy_kwh * 3.6) / 10).toBeCloseTo(141.79, 2);
    expect(
      ((okOf(hydrogen).details.max_work_kwh as number) * 3.6) / 10,
    ).toBeCloseTo(117.64, 2);
    const heatingOk = okOf(heating);
    expect(heatingOk.details.exergy_kwh).toBeCloseTo(
      (4.963370272 * (heatingOk.details.mass_kg as number)) / 1000,
      6,
    );
    expect(okOf(chilled).energy_kwh).toBeLessThan(0);
    expect(okOf(chilled).details.exergy_kwh).toBeGreaterThan(0);
    expect(errorOf(badCv)).toBe(
      "calorific_value_mj_m3: 61 MJ/m³ is outside 10 MJ/m³ to 60 MJ/m³",
    );
    expect(errorOf(badStock)).toMatch(
      /^opening_stock_l \+ deliveries_l − closing_stock_l = -200 l is negative/,
    );
    expect(errorOf(badAmbient)).toMatch(
      /^ambient_temp_c: 76 °C is outside -50 °C to 50 °C$/,
    );
    expect(errorOf(coldGas)).toBe(
      "gas_temp_c: -21 °C is outside -20 °C to 60 °C",
    );
  });
});

describe("POST /api/v1/energy/evaluate: steam state and the phase rule", () => {
  it("pressure and saturation temperature that agree are accepted: T_s(10 bar a) = 179.886 °C (IF97 Table 36)", async () => {
    const r = okOf(
      await evaluateOne({
        quantity: "steam_heat",
        mass_kg: 1,
        pressure_bar_abs: 10,
        saturation_temp_c: 179.9,
      }),
    );
    expect(r.details.saturation_temp_c).toBeCloseTo(179.886, 3);
  });

  it("pressure and saturation temperature that disagree are rejected (Gibbs phase rule)", async () => {
    const results = await evaluate([
      {
        quantity: "steam_heat",
        mass_kg: 1,
        pressure_bar_abs: 10,
        saturation_temp_c: 150,
      },
      // 7 bar read as absolute gives T_s = 164.95 °C, not the 170.48 °C of
      // 7 bar g (references.md §2, pitfalls).
      {
        quantity: "steam_heat",
        mass_kg: 1,
        pressure_bar_g: 7,
        saturation_temp_c: 164.95,
      },
      STEAM,
    ]);
    expect(errorOf(results[0])).toMatch(
      /^saturation_temp_c: .*phase rule.*must agree within 1 K$/,
    );
    expect(errorOf(results[1])).toMatch(
      /^saturation_temp_c: gives a saturation temperature of 164\.95 °C.*170\.48 °C/,
    );
    okOf(results[2]);
  });

  it("condensate hotter than saturation is rejected; within 1 K it is taken as saturated", async () => {
    const results = await evaluate([
      { ...STEAM, condensate_temp_c: 180 },
      { ...STEAM, condensate_temp_c: 171 },
      { ...STEAM, condensate_temp_c: 95 },
    ]);
    expect(errorOf(results[0])).toMatch(
      /^condensate_temp_c: 180 °C is hotter than the saturation temperature 170\.48 °C/,
    );
    const within = okOf(results[1]);
    expect(within.details.condensate).toBe("at_saturation_within_tolerance");
    expect(within.energy_mj).toBeCloseTo(2047.05, 2);
    // Subcooled condensate gives up its sensible heat as well as h_fg.
    const subcooled = okOf(results[2]);
    expect(subcooled.details.condensate).toBe("subcooled_liquid");
    expect(subcooled.energy_mj).toBeGreaterThan(within.energy_mj);
  });
});

describe("POST /api/v1/energy/evaluate: registers", () => {
  it("a roll-over is capacity − start + end, times the multiplier", async () => {
    const r = okOf(
      await evaluateOne({
        quantity: "electric_register",
        register_start_kwh: 99_990,
        register_end_kwh: 15,
        register_capacity_kwh: 100_000,
        multiplier: 10,
      }),
    );
    expect(r.details.register_kind).toBe("rollover");
    expect(r.details.register_delta_kwh).toBe(25);
    expect(r.energy_kwh).toBe(250);
    expect(r.energy_mj).toBe(900);
  });

  it("a drop with no roll-over point, or too large to be one, is flagged", async () => {
    const results = await evaluate([
      { ...HEAT_REGISTER, register_start_kwh: 500, register_end_kwh: 400 },
      {
        ...HEAT_REGISTER,
        register_start_kwh: 500,
        register_end_kwh: 400,
        register_capacity_kwh: 100_000,
      },
    ]);
    for (const r of results) {
      expect(errorOf(r)).toMatch(/^register_end_kwh: register_drop: /);
    }
  });
});

describe("POST /api/v1/energy/evaluate: request errors", () => {
  it("10,001 items is a 400 request error naming items", async () => {
    const body = await requestError(
      await post({ items: Array(10_001).fill(WATER) }),
      400,
    );
    expect(body.error.code).toBe("invalid_body");
    expect(body.error.issues?.map((i) => i.path)).toEqual(["items"]);
  });

  it("an empty items array is a 400 request error", async () => {
    const body = await requestError(await post({ items: [] }), 400);
    expect(body.error.code).toBe("invalid_body");
    expect(body.error.issues?.map((i) => i.path)).toEqual(["items"]);
  });

  it("an object without items, or with items that is not an array, is a 400", async () => {
    for (const envelope of [{}, { items: {} }, { items: "all" }]) {
      const body = await requestError(await post(envelope), 400);
      expect(body.error.code).toBe("invalid_body");
      expect(body.error.issues?.map((i) => i.path)).toContain("items");
    }
  });

  it("a JSON array as the body is a 400 invalid_body", async () => {
    const body = await requestError(await post([WATER]), 400);
    expect(body.error.code).toBe("invalid_body");
    expect(body.error.issues?.map((i) => i.path)).toEqual(["(body)"]);
  });

  it("a JSON string, number or null as the body is a 400 invalid_json (objects and arrays only)", async () => {
    for (const text of ['"items"', "42", "null", "true"]) {
      const body = await requestError(await post(text), 400);
      expect(body.error.code, text).toBe("invalid_json");
    }
  });

  it("a body that is not sent as JSON is a 400 invalid_body", async () => {
    const response = await new Client().request(EVALUATE, {
      method: "POST",
      headers: {
        authorization: `Bearer ${DEMO_KEY}`,
        "content-type": "text/plain",
      },
      body: JSON.stringify({ items: [WATER] }),
    });
    const body = await requestError(response, 400);
    expect(body.error.code).toBe("invalid_body");
  });
});
