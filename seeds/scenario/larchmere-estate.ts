// The invented demo estate: Larchmere Borough Estates, seven sites and the
// meters on their boundaries (design.md, "Demo scenario"). Every name,
// address, serial number and figure here is made up. Plain data, so the
// database seed and the tests read the same description.

import type {
  Carrier,
  MeterPosition,
  Orientation,
  Quantity,
  SensorPosition,
} from "../../app/sites/meter-kinds";
import type { PlantKind, PlantMeterRole } from "../../app/plant/plant-roles";
import { SCHOOL_BOILER_PLANT, SCHOOL_GAS_METERS } from "./gas-supplies";

export interface ScenarioSite {
  name: string;
  timeZone: "Europe/London";
  floorAreaM2: number;
  degreeDayBaseC: number;
  address: string;
}

export interface ScenarioMeter {
  code: string;
  name: string;
  siteName: string;
  quantity: Quantity;
  carrier: Carrier;
  orientation: Orientation;
  /** Inside the boundary (a plant's output): left out of delivered energy. */
  position?: MeterPosition;
  parentCode?: string;
  serial: string;
  multiplier: number;
  /** Register roll-over point: the value at which it wraps to zero. */
  rolloverKwh?: number;
  sensorAt?: SensorPosition;
  defaultPressureBarAbs?: number;
  /** ISO 8601, UTC. */
  installedAt: string;
  removedAt?: string;
  replacedByCode?: string;
}

export const ORGANIZATION_NAME = "Larchmere Borough Estates";

/** Two years of hourly data, [from, to). */
export const SCENARIO_PERIOD = {
  from: new Date("2024-12-01T00:00:00Z"),
  to: new Date("2026-12-01T00:00:00Z"),
} as const;

export const SITE = {
  civicHall: "Civic Hall",
  school: "Northgate Primary School",
  pool: "Larchmere Leisure Pool",
  depot: "Depot & Laundry",
  library: "Riverside Library",
  housing: "Brookfield Sheltered Housing",
  dataRoom: "Data Room",
} as const;

// 15.5 °C is the usual UK degree-day base for offices and schools (common
// practice); sheltered housing for older residents is kept warmer, so its
// heating starts at a higher outdoor temperature.
export const SITES: readonly ScenarioSite[] = [
  {
    name: SITE.civicHall,
    timeZone: "Europe/London",
    floorAreaM2: 4800,
    degreeDayBaseC: 15.5,
    address: "1 Market Square, Larchmere LM1 1AA",
  },
  {
    name: SITE.school,
    timeZone: "Europe/London",
    floorAreaM2: 2600,
    degreeDayBaseC: 15.5,
    address: "Northgate Lane, Larchmere LM2 4NP",
  },
  {
    name: SITE.pool,
    timeZone: "Europe/London",
    floorAreaM2: 3900,
    degreeDayBaseC: 15.5,
    address: "Meadow Road, Larchmere LM3 7LP",
  },
  {
    name: SITE.depot,
    timeZone: "Europe/London",
    floorAreaM2: 2200,
    degreeDayBaseC: 15.5,
    address: "Unit 2, Tannery Yard, Larchmere LM4 2DL",
  },
  {
    name: SITE.library,
    timeZone: "Europe/London",
    floorAreaM2: 1400,
    degreeDayBaseC: 15.5,
    address: "12 River Walk, Larchmere LM1 3RL",
  },
  {
    name: SITE.housing,
    timeZone: "Europe/London",
    floorAreaM2: 3300,
    degreeDayBaseC: 17,
    address: "Brookfield Close, Larchmere LM5 1BH",
  },
  {
    name: SITE.dataRoom,
    timeZone: "Europe/London",
    floorAreaM2: 180,
    degreeDayBaseC: 15.5,
    address: "Unit 4, Tannery Yard, Larchmere LM4 2DR",
  },
];

const LONG_AGO = "2019-06-01T00:00:00Z";

/** The school's electricity meter is swapped at this instant (an hour). */
export const SCHOOL_METER_SWAP_AT = "2025-08-12T10:00:00Z";

/**
 * The library's register shows 99 999.9 kWh at most and wraps at 100 000 kWh
 * (six digits, one decimal); it starts at 52 300 kWh and crosses the wrap
 * once in the two years.
 */
export const LIBRARY_ROLLOVER_KWH = 100_000;

export const METERS: readonly ScenarioMeter[] = [
  {
    code: "CH-HX1",
    name: "District heat intake",
    siteName: SITE.civicHall,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    serial: "DH-22-04571",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 8,
    installedAt: LONG_AGO,
  },
  {
    code: "CH-EL1",
    name: "Grid supply (200/5 A CTs)",
    siteName: SITE.civicHall,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-18-220931",
    // 200/5 A current transformers: the register counts 1/40 of the energy.
    multiplier: 40,
    installedAt: LONG_AGO,
  },
  {
    code: "NP-HX1",
    name: "Boiler house heat meter",
    siteName: SITE.school,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    serial: "HM-17-11820",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 3,
    installedAt: LONG_AGO,
  },
  {
    code: "NP-EL1",
    name: "Grid supply (old meter)",
    siteName: SITE.school,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-09-004417",
    multiplier: 1,
    installedAt: LONG_AGO,
    removedAt: SCHOOL_METER_SWAP_AT,
    replacedByCode: "NP-EL2",
  },
  {
    code: "NP-EL2",
    name: "Grid supply",
    siteName: SITE.school,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-25-310562",
    multiplier: 1,
    installedAt: SCHOOL_METER_SWAP_AT,
  },
  {
    code: "LP-HX1",
    name: "Boiler plant heat meter",
    siteName: SITE.pool,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    serial: "HM-20-30447",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 4,
    installedAt: LONG_AGO,
  },
  {
    code: "LP-EL1",
    name: "Grid import",
    siteName: SITE.pool,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-20-118804",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "LP-PV1",
    name: "Rooftop solar export",
    siteName: SITE.pool,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "export",
    serial: "EL-21-118805",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "DL-ST1",
    name: "Laundry steam (condensate)",
    siteName: SITE.depot,
    quantity: "steam_heat",
    carrier: "steam",
    orientation: "import",
    serial: "ST-16-00291",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "DL-EL1",
    name: "Grid supply",
    siteName: SITE.depot,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-16-077310",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "RL-HX1",
    name: "Heating heat meter",
    siteName: SITE.library,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    serial: "HM-19-20913",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 3,
    installedAt: LONG_AGO,
  },
  {
    code: "RL-CW1",
    name: "Archive room chilled water",
    siteName: SITE.library,
    quantity: "water_heat",
    carrier: "cooling",
    orientation: "import",
    serial: "CM-19-20914",
    multiplier: 1,
    sensorAt: "flow",
    defaultPressureBarAbs: 3,
    installedAt: LONG_AGO,
  },
  {
    code: "RL-EL1",
    name: "Grid supply",
    siteName: SITE.library,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-12-050338",
    multiplier: 1,
    rolloverKwh: LIBRARY_ROLLOVER_KWH,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HX0",
    name: "Main heat meter (energy centre)",
    siteName: SITE.housing,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    serial: "HM-18-40100",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 5,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HXA",
    name: "Block A, Alder Court",
    siteName: SITE.housing,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    parentCode: "BH-HX0",
    serial: "HM-18-40101",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 5,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HXB",
    name: "Block B, Birch Court",
    siteName: SITE.housing,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    parentCode: "BH-HX0",
    serial: "HM-18-40102",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 5,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HXC",
    name: "Block C, Cedar Court",
    siteName: SITE.housing,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    parentCode: "BH-HX0",
    serial: "HM-18-40103",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 5,
    installedAt: LONG_AGO,
  },
  // Plant added to the estate (all invented): a gas boiler house at the
  // depot, a heat pump for the sheltered housing's lounge and hot water,
  // and a hydrogen fuel-cell CHP at the pool. Their output meters sit
  // inside the boundaries; the gas, the hydrogen and the heat pump's
  // electricity cross them.
  {
    code: "DL-GS1",
    name: "Gas supply to the boiler house",
    siteName: SITE.depot,
    quantity: "gas_volume",
    carrier: "natural_gas",
    orientation: "import",
    serial: "GM-17-31207",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "DL-HX2",
    name: "Boiler house heat meter",
    siteName: SITE.depot,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    position: "internal",
    serial: "HM-17-31208",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 3,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HPE",
    name: "Heat pump electricity",
    siteName: SITE.housing,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-23-118402",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "BH-HPH",
    name: "Heat pump heat meter (lounge and hot water)",
    siteName: SITE.housing,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    position: "internal",
    serial: "HM-23-118403",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 3,
    installedAt: LONG_AGO,
  },
  {
    code: "LP-H21",
    name: "Hydrogen to the fuel cell",
    siteName: SITE.pool,
    quantity: "hydrogen",
    carrier: "hydrogen",
    orientation: "import",
    serial: "HY-24-00312",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "LP-FCE",
    name: "Fuel cell electricity out",
    siteName: SITE.pool,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    position: "internal",
    serial: "EL-24-00313",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  {
    code: "LP-FCH",
    name: "Fuel cell heat recovery",
    siteName: SITE.pool,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    position: "internal",
    serial: "HM-24-00314",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 4,
    installedAt: LONG_AGO,
  },
  {
    code: "DR-CW1",
    name: "Chilled water to the room coolers",
    siteName: SITE.dataRoom,
    quantity: "water_heat",
    carrier: "cooling",
    orientation: "import",
    serial: "CM-21-60017",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 4,
    installedAt: LONG_AGO,
  },
  {
    code: "DR-EL1",
    name: "Grid supply",
    siteName: SITE.dataRoom,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    serial: "EL-21-090126",
    multiplier: 1,
    installedAt: LONG_AGO,
  },
  // The school's gas boiler house (gas-supplies.ts).
  ...SCHOOL_GAS_METERS,
];

export interface ScenarioPlant {
  siteName: string;
  name: string;
  kind: PlantKind;
  meters: Partial<Record<PlantMeterRole, string>>;
  heatFlowC: number;
  heatReturnC: number;
}

export const PLANTS: readonly ScenarioPlant[] = [
  {
    siteName: SITE.depot,
    name: "Boiler house",
    kind: "boiler",
    meters: { fuel_in: "DL-GS1", heat_out: "DL-HX2" },
    heatFlowC: 75,
    heatReturnC: 60,
  },
  {
    siteName: SITE.housing,
    name: "Lounge heat pump",
    kind: "heat_pump",
    meters: { electricity_in: "BH-HPE", heat_out: "BH-HPH" },
    heatFlowC: 45,
    heatReturnC: 40,
  },
  {
    siteName: SITE.pool,
    name: "Fuel-cell CHP",
    kind: "fuel_cell",
    meters: {
      fuel_in: "LP-H21",
      electricity_out: "LP-FCE",
      heat_out: "LP-FCH",
    },
    heatFlowC: 60,
    heatReturnC: 40,
  },
  SCHOOL_BOILER_PLANT,
];

/**
 * The planted fault: in this site-local month the boiler house heat meter
 * over-reads by a fifth (a flow sensor fouled, say), so the boiler shows
 * above 100 % of its gas's gross energy and the plant check flags it.
 */
export const BOILER_FAULT = {
  meter: "DL-HX2",
  month: "2026-02",
  overRead: 1.22,
} as const;

export interface ScenarioGap {
  meter: string;
  /** First missing hour (UTC); for a register, the first missing read. */
  start: string;
  hours: number;
}

/**
 * Hours the gateways never sent: several short outages (2–5 h, a gateway
 * reboot or a network fault) and one of three days (a failed gateway
 * modem at the school during a cold spell, awaiting a site visit).
 */
export const SCENARIO_GAPS: readonly ScenarioGap[] = [
  { meter: "CH-HX1", start: "2025-01-14T09:00:00Z", hours: 3 },
  { meter: "LP-HX1", start: "2025-03-03T02:00:00Z", hours: 5 },
  { meter: "DL-ST1", start: "2025-06-10T13:00:00Z", hours: 2 },
  { meter: "RL-CW1", start: "2025-07-22T11:00:00Z", hours: 4 },
  { meter: "BH-HXB", start: "2025-11-05T17:00:00Z", hours: 3 },
  { meter: "DR-EL1", start: "2026-02-18T06:00:00Z", hours: 4 },
  { meter: "NP-HX1", start: "2026-01-19T08:00:00Z", hours: 72 },
];

export function meterByCode(code: string): ScenarioMeter {
  const m = METERS.find((x) => x.code === code);
  if (m === undefined) throw new RangeError(`no scenario meter ${code}`);
  return m;
}

export function siteByName(name: string): ScenarioSite {
  const s = SITES.find((x) => x.name === name);
  if (s === undefined) throw new RangeError(`no scenario site ${name}`);
  return s;
}
