// Request and result schemas of POST /api/v1/energy/evaluate (design.md,
// "Gateway API"), in zod 4. The served OpenAPI document is generated from
// them (app/api/openapi.server.ts), so it cannot drift from what is enforced.
//
// Items are shaped like readings without `meter`. Objects are strict
// (unknown fields are rejected) and numbers must be JSON numbers: zod 4's
// z.number() rejects strings, NaN and ±Infinity.
//
// Optional EN 1434 fields on water_heat items (an extension of design.md):
// meter_class (1, 2 or 3), delta_theta_min_k (the meter's Δθmin),
// qp_m3_per_h (the flow sensor's permanent flow rate) and flow_m3_per_h (the
// flow rate in the interval; derived as volume / duration when absent). When
// meter_class is given the result carries the meter's MPE as a ± band.
//
// Fuels, hydrogen and exergy (design.md, December 2026): the items
// gas_volume, liquid_fuel and hydrogen, and water_heat's ambient_temp_c;
// and, as an extension, solid_fuel for biomass by weight.
// Physical and meter ranges (CV, gas temperature, density, ambient) are
// checked by the physics modules, whose reasons name the field and the range.

import { z } from "zod";

/**
 * Fuel quantities: what a gas meter, an oil tank or a hydrogen meter gives.
 * Meters measure them and readings carry them like the others.
 */
export const FUEL_QUANTITIES = [
  "gas_volume",
  "liquid_fuel",
  "hydrogen",
  // Biomass by weight (an extension of design.md: solid-fuel.ts).
  "solid_fuel",
] as const;

/**
 * What a meter can measure (the database enum takes its values from here,
 * through app/sites/meter-kinds.ts) and what a reading may carry.
 */
export const QUANTITIES = [
  "water_heat",
  "steam_heat",
  "sensible_heat",
  "electric_work",
  "electric_register",
  "heat_register",
  ...FUEL_QUANTITIES,
] as const;

/** Every quantity POST /api/v1/energy/evaluate accepts. */
export const EVALUATE_QUANTITIES = QUANTITIES;

function describeInput(input: unknown): string {
  if (typeof input === "number") {
    return Number.isNaN(input) ? "NaN" : String(input);
  }
  if (input === null) return "null";
  return `a ${typeof input}`;
}

// A finite JSON number; the message names what arrived instead.
function num(description: string) {
  return z
    .number({
      // Every message names what arrived, so a gateway's log shows the value.
      // The parameter is typed for the type check only, but zod passes the
      // number's range issues through the same function.
      error: (typed) => {
        const issue = typed as unknown as {
          code: string;
          input: unknown;
          minimum?: unknown;
          maximum?: unknown;
          inclusive?: boolean;
        };
        const got = describeInput(issue.input);
        if (issue.code === "too_small") {
          return `must be ${issue.inclusive ? "at least" : "greater than"} ${String(issue.minimum)}, got ${got}`;
        }
        if (issue.code === "too_big") {
          return `must be ${issue.inclusive ? "at most" : "less than"} ${String(issue.maximum)}, got ${got}`;
        }
        if (issue.code !== "invalid_type") return undefined;
        return issue.input === undefined
          ? "is required"
          : `expected a finite number, got ${got}`;
      },
    })
    .describe(description);
}

const isoTime = z.iso
  .datetime({ offset: true, error: "expected an ISO 8601 date-time" })
  .describe("ISO 8601 date-time with offset, e.g. 2026-03-01T00:00:00Z");

// Durations: `seconds`, or `start` and `end` (end − start); both may be given
// if they agree.
const timing = {
  start: isoTime.optional(),
  end: isoTime.optional(),
  seconds: num("Duration of the interval, s").min(0).optional(),
};

const pressures = {
  pressure_bar_abs: num("Absolute pressure, bar").optional(),
  pressure_bar_g: num(
    "Gauge pressure, bar; absolute = gauge + 1.01325 bar",
  ).optional(),
};

export const waterHeatItemSchema = z
  .strictObject({
    quantity: z.literal("water_heat"),
    ...timing,
    volume_m3: num("Volume registered by the flow sensor, m³").min(0),
    flow_temp_c: num("Flow (supply) temperature, °C"),
    return_temp_c: num("Return temperature, °C"),
    ...pressures,
    sensor_at: z
      .enum(["flow", "return"])
      .describe("Pipe the flow sensor sits in (required here: no meter)"),
    meter_class: z
      .literal([1, 2, 3])
      .optional()
      .describe("EN 1434 accuracy class, for the MPE band"),
    delta_theta_min_k: num("Meter's Δθmin, K").positive().optional(),
    flow_m3_per_h: num("Flow rate in the interval, m³/h").positive().optional(),
    qp_m3_per_h: num("Flow sensor's permanent flow qp, m³/h")
      .positive()
      .optional(),
    ambient_temp_c: num(
      "Dead-state (ambient) temperature T₀ for details.exergy_kwh, °C: " +
        "-50 to 50 °C, below the flow temperature for heating, above it " +
        "for chilled water",
    ).optional(),
  })
  .describe(
    "Heat carried by water: exactly one of pressure_bar_abs and " +
      "pressure_bar_g; meter_class needs delta_theta_min_k and qp_m3_per_h.",
  );

export const steamHeatItemSchema = z
  .strictObject({
    quantity: z.literal("steam_heat"),
    ...timing,
    mass_kg: num("Condensate collected, kg").min(0),
    ...pressures,
    saturation_temp_c: num(
      "Saturation temperature, °C: 0 to 250.36 °C, the saturation " +
        "temperatures of the 0.00611-40 bar a pressure range",
    ).optional(),
    condensate_temp_c: num(
      "Condensate temperature, °C: 0 °C up to the saturation temperature " +
        "(within 1 K above it is taken as saturated)",
    ).optional(),
  })
  .describe(
    "Condensing saturated steam: at least one of pressure_bar_abs, " +
      "pressure_bar_g, saturation_temp_c; several must agree (phase rule).",
  );

export const sensibleHeatItemSchema = z.strictObject({
  quantity: z.literal("sensible_heat"),
  ...timing,
  mass_kg: num("Mass of the medium, kg").min(0),
  specific_heat_kj_per_kg_k: num(
    "Declared specific heat, kJ/(kg·K)",
  ).positive(),
  inlet_temp_c: num("Inlet temperature, °C"),
  outlet_temp_c: num("Outlet temperature, °C"),
});

export const electricWorkItemSchema = z
  .strictObject({
    quantity: z.literal("electric_work"),
    ...timing,
    circuit: z.enum(["dc", "single_phase", "three_phase"]),
    volts: num("RMS volts (DC volts for dc)").min(0),
    voltage_basis: z
      .enum(["line_to_line", "line_to_neutral"])
      .optional()
      .describe("Three-phase only; default line_to_line"),
    amps: num("RMS amps per line").min(0),
    power_factor: num("cos φ, AC only, default 1").gt(0).max(1).optional(),
  })
  .describe("Electrical work; the duration is `seconds` or end − start.");

const registerFields = {
  start: isoTime.optional(),
  end: isoTime.optional(),
  register_start_kwh: num("Register at the start, kWh").min(0),
  register_end_kwh: num("Register at the end, kWh").min(0),
  multiplier: num("CT/VT ratio or meter multiplier, default 1")
    .positive()
    .optional(),
  register_capacity_kwh: num("Roll-over point of the register, kWh")
    .positive()
    .optional(),
};

export const electricRegisterItemSchema = z.strictObject({
  quantity: z.literal("electric_register"),
  ...registerFields,
});

export const heatRegisterItemSchema = z.strictObject({
  quantity: z.literal("heat_register"),
  ...registerFields,
});

const cvBasis = z
  .enum(["gross", "net"])
  .optional()
  .describe("Basis of the CV: gross (higher, default) or net (lower)");

export const gasVolumeItemSchema = z
  .strictObject({
    quantity: z.literal("gas_volume"),
    ...timing,
    volume_m3: num("Metered volume at line conditions, m³").min(0).optional(),
    volume_ft3: num(
      "Metered volume at line conditions, ft³ (1 ft³ = 0.028316846592 m³)",
    )
      .min(0)
      .optional(),
    calorific_value_mj_m3: num(
      "CV at 15 °C and 1013.25 mbar (EN ISO 13443), MJ/m³: 10 to 60",
    ),
    cv_basis: cvBasis,
    correction_factor: num(
      "Volume correction to 15 °C and 1013.25 mbar, as stated by the supplier",
    ).optional(),
    gas_temp_c: num("Gas temperature at the meter, °C: -20 to 60").optional(),
    gas_pressure_mbar_g: num(
      "Gas pressure at the meter, mbar gauge: 0 to 5000",
    ).optional(),
    atmospheric_pressure_mbar: num(
      "Atmospheric pressure, mbar: 700 to 1100, default 1013.25",
    ).optional(),
  })
  .describe(
    "Natural gas: exactly one of volume_m3 and volume_ft3; the volume is " +
      "corrected by correction_factor, or from gas_temp_c with " +
      "gas_pressure_mbar_g (ideal gas), or taken as already at 15 °C and " +
      "1013.25 mbar. energy_kwh = V × correction × CV / 3.6.",
  );

export const liquidFuelItemSchema = z
  .strictObject({
    quantity: z.literal("liquid_fuel"),
    ...timing,
    volume_l: num("Volume consumed, litres").min(0).optional(),
    opening_stock_l: num("Stock in the tank at the start, litres")
      .min(0)
      .optional(),
    deliveries_l: num("Deliveries between the two stock readings, litres")
      .min(0)
      .optional(),
    closing_stock_l: num("Stock in the tank at the end, litres")
      .min(0)
      .optional(),
    density_kg_l: num("Density, kg/l: 0.5 to 1.1"),
    calorific_value_mj_kg: num("CV, MJ/kg: 20 to 55"),
    cv_basis: cvBasis,
  })
  .describe(
    "Liquid fuel: volume_l, or opening_stock_l + deliveries_l − " +
      "closing_stock_l (all three). energy_kwh = L × ρ × CV / 3.6.",
  );

export const hydrogenItemSchema = z
  .strictObject({
    quantity: z.literal("hydrogen"),
    ...timing,
    mass_kg: num("Hydrogen, kg").min(0).optional(),
    volume_nm3: num("Hydrogen at 0 °C and 101.325 kPa, m³").min(0).optional(),
    basis: z
      .enum(["gross", "net"])
      .optional()
      .describe(
        "gross (default, liquid water formed, 285.830 kJ/mol) or net " +
          "(vapour, 241.826 kJ/mol)",
      ),
  })
  .describe(
    "Hydrogen: exactly one of mass_kg and volume_nm3; details.max_work_kwh " +
      "is the most electrical work a fuel cell can get from it (|ΔG|).",
  );

export const solidFuelItemSchema = z
  .strictObject({
    quantity: z.literal("solid_fuel"),
    ...timing,
    mass_kg: num("Fuel burnt, kg, as weighed (wet)").min(0),
    calorific_value_mj_kg: num(
      "CV, MJ/kg: 5 to 35, per kg as weighed or of dry matter (cv_moisture_basis)",
    ),
    cv_basis: cvBasis,
    cv_moisture_basis: z
      .enum(["as_received", "dry"])
      .optional()
      .describe(
        "The mass the CV is per: as_received (default, the wet fuel as " +
          "weighed) or dry (its dry matter; needs moisture_percent)",
      ),
    moisture_percent: num(
      "Moisture, % of the wet mass: 0 to 70; required with a dry-basis CV",
    ).optional(),
  })
  .describe(
    "Solid fuel (biomass: logs, chips, pellets): energy_kwh = m × CV / 3.6, " +
      "with a dry-basis CV turned into the as-received one by the moisture " +
      "(EN ISO 18125: gross × (1 − M/100); net × (1 − M/100) − 0.02443 × M).",
  );

export const evaluateItemSchema = z.discriminatedUnion("quantity", [
  waterHeatItemSchema,
  steamHeatItemSchema,
  sensibleHeatItemSchema,
  electricWorkItemSchema,
  electricRegisterItemSchema,
  heatRegisterItemSchema,
  gasVolumeItemSchema,
  liquidFuelItemSchema,
  hydrogenItemSchema,
  solidFuelItemSchema,
]);

export type EvaluateItem = z.infer<typeof evaluateItemSchema>;

export const MAX_EVALUATE_ITEMS = 10000;

// `items` stays an array of unknown: each item is parsed on its own so that
// one bad item is reported in its place and never fails the others.
export const evaluateRequestSchema = z.strictObject({
  items: z.array(z.unknown()).min(1).max(MAX_EVALUATE_ITEMS),
});

const detailValue = z.union([z.number(), z.string(), z.null()]);

export const evaluateSuccessSchema = z.strictObject({
  ok: z.literal(true),
  energy_kwh: z.number().describe("Energy delivered to the load, kWh"),
  energy_mj: z.number().describe("The same energy, MJ"),
  method: z.string().describe('e.g. "iapws-if97/water-heat"'),
  details: z.record(z.string(), detailValue),
});

export const evaluateFailureSchema = z.strictObject({
  ok: z.literal(false),
  error: z.string().describe("Plain reason, with the field path"),
});

export const evaluateResultSchema = z.discriminatedUnion("ok", [
  evaluateSuccessSchema,
  evaluateFailureSchema,
]);

export type EvaluateResult = z.infer<typeof evaluateResultSchema>;

export const evaluateResponseSchema = z.strictObject({
  results: z.array(evaluateResultSchema),
});

/**
 * A request whose every item is valid: what the API document shows as the
 * body. The server parses only the envelope (evaluateRequestSchema) and then
 * each item on its own, so a bad item is answered in its place.
 */
export const wellFormedEvaluateRequestSchema = evaluateRequestSchema.extend({
  items: z.array(evaluateItemSchema).min(1).max(MAX_EVALUATE_ITEMS),
});

/**
 * The schemas the API document names as components (`#/components/schemas/…`);
 * OpenAPI's discriminator then picks the item schema by `quantity`.
 */
export const evaluateComponents = {
  DateTime: isoTime,
  WaterHeatItem: waterHeatItemSchema,
  SteamHeatItem: steamHeatItemSchema,
  SensibleHeatItem: sensibleHeatItemSchema,
  ElectricWorkItem: electricWorkItemSchema,
  ElectricRegisterItem: electricRegisterItemSchema,
  HeatRegisterItem: heatRegisterItemSchema,
  GasVolumeItem: gasVolumeItemSchema,
  LiquidFuelItem: liquidFuelItemSchema,
  HydrogenItem: hydrogenItemSchema,
  SolidFuelItem: solidFuelItemSchema,
  EvaluateItem: evaluateItemSchema,
  EvaluateRequest: wellFormedEvaluateRequestSchema,
  EvaluateSuccess: evaluateSuccessSchema,
  EvaluateFailure: evaluateFailureSchema,
  EvaluateResult: evaluateResultSchema,
  EvaluateResponse: evaluateResponseSchema,
} as const;
