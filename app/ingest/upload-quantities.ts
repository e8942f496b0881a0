/**
 * What a file of readings may hold, in plain words for the upload page, and a
 * CSV template per meter kind in the API's own field names (the reading
 * schema's: app/ingest/reading-schema.ts, app/physics/evaluate-schema.ts).
 * kWh per interval, the commonest supplier data, has its own templates in
 * the supplier-file layer (supplier-files/templates.ts).
 */
import { quantityLabels, type Quantity } from "../sites/meter-kinds";

export interface UploadQuantity {
  quantity: Quantity;
  /** The meter kind, as the meter form names it. */
  label: string;
  /** What a row gives, in words. */
  words: string;
  /** The template's header and an example row (the demo estate's invented codes). */
  header: string[];
  example: string[];
}

const START = "2026-04-14T00:00:00Z";
const END = "2026-04-14T01:00:00Z";

/** Per meter kind: what a row gives, and its fields after meter and quantity with example values. */
const ROWS: Record<
  Quantity,
  { words: string; fields: Record<string, string> }
> = {
  water_heat: {
    words:
      "Heat meter on water: the volume through the meter in an interval, flow and return temperatures, and the pressure (or the meter's default).",
    fields: {
      start: START,
      end: END,
      volume_m3: "1.85",
      flow_temp_c: "72.5",
      return_temp_c: "48.0",
      pressure_bar_abs: "6",
    },
  },
  steam_heat: {
    words:
      "Steam meter: condensate collected in an interval, kg, and the steam pressure.",
    fields: {
      start: START,
      end: END,
      mass_kg: "410",
      pressure_bar_abs: "8",
    },
  },
  sensible_heat: {
    words:
      "Other heat transfer media: mass in an interval, the declared specific heat and inlet and outlet temperatures.",
    fields: {
      start: START,
      end: END,
      mass_kg: "1200",
      specific_heat_kj_per_kg_k: "3.6",
      inlet_temp_c: "12",
      outlet_temp_c: "7",
    },
  },
  electric_work: {
    words:
      "Electricity from volts, amps and power factor over an interval (dc, single or three phase).",
    fields: {
      start: START,
      end: END,
      circuit: "three_phase",
      volts: "400",
      amps: "52",
      power_factor: "0.93",
    },
  },
  electric_register: {
    words:
      "Electricity register reads: the cumulative kWh on the meter's display at a time.",
    fields: { time: START, register_kwh: "48213.7" },
  },
  heat_register: {
    words:
      "Heat register reads: the cumulative kWh on the heat meter's display at a time.",
    fields: { time: START, register_kwh: "91527.0" },
  },
  gas_volume: {
    words:
      "Natural gas: the volume through the meter in an interval, m³, with the supply's calorific value (MJ/m³, gross unless cv_basis says net) and its volume correction factor.",
    fields: {
      start: START,
      end: END,
      volume_m3: "12.4",
      calorific_value_mj_m3: "39.4",
      cv_basis: "gross",
      correction_factor: "1.02264",
    },
  },
  liquid_fuel: {
    words:
      "Oil or LPG from a tank: the stock at the start, deliveries and the stock at the end of an interval (litres), with the fuel's density and calorific value.",
    fields: {
      start: START,
      end: END,
      opening_stock_l: "5200",
      deliveries_l: "0",
      closing_stock_l: "5160",
      density_kg_l: "0.845",
      calorific_value_mj_kg: "45.5",
      cv_basis: "gross",
    },
  },
  hydrogen: {
    words: "Hydrogen: the mass used in an interval, kg.",
    fields: { start: START, end: END, mass_kg: "0.8", basis: "gross" },
  },
  solid_fuel: {
    words:
      "Biomass (logs, chips, pellets): the mass burnt in an interval, kg as weighed, with its calorific value (MJ/kg as received, or per kg of dry matter with the moisture content).",
    fields: {
      start: START,
      end: END,
      mass_kg: "62",
      calorific_value_mj_kg: "17.1",
      cv_basis: "net",
      cv_moisture_basis: "as_received",
      moisture_percent: "8",
    },
  },
};

const EXAMPLE_METER: Record<Quantity, string> = {
  water_heat: "CH-HT1",
  steam_heat: "CH-ST1",
  sensible_heat: "CH-CL1",
  electric_work: "CH-EL2",
  electric_register: "CH-EL1",
  heat_register: "NP-HT1",
  gas_volume: "NP-GS1",
  liquid_fuel: "DL-OT1",
  hydrogen: "LP-H21",
  solid_fuel: "BH-BM1",
};

export const UPLOAD_QUANTITIES: readonly UploadQuantity[] = (
  Object.keys(ROWS) as Quantity[]
).map((quantity) => {
  const { words, fields } = ROWS[quantity];
  return {
    quantity,
    label: quantityLabels[quantity],
    words,
    header: ["meter", "quantity", ...Object.keys(fields)],
    example: [EXAMPLE_METER[quantity], quantity, ...Object.values(fields)],
  };
});

/** A template in the API's field names for one meter kind: the header and one example row. */
export function apiFieldTemplate(quantity: Quantity): string {
  const q = UPLOAD_QUANTITIES.find((u) => u.quantity === quantity);
  if (q === undefined) throw new Error(`no template for ${quantity}`);
  return `${q.header.join(",")}\n${q.example.join(",")}\n`;
}

export function apiFieldTemplateName(quantity: Quantity): string {
  return `readings-${quantity.replaceAll("_", "-")}.csv`;
}
