// ILLUSTRATIVE TARIFFS, INVENTED FOR THE DEMO. No supplier offers these rates;
// they are round, plausible-looking figures in GBP so the Ledger shows cost
// beside energy. Plain data: the seed (seeds/seed-tariffs.ts) and the tests
// read the same description.

import type { Carrier } from "../../app/sites/meter-kinds";
import type { TariffRates } from "../../app/tariffs/tariff-schema";
import { METERS, SITE } from "./larchmere-estate";

export interface ScenarioTariff {
  siteName: string;
  carrier: Carrier;
  name: string;
  /** Oldest first; the first version runs from the scenario's start. */
  versions: { validFrom: string; rates: TariffRates }[];
}

const FROM = "2024-12-01";
/** The mid-2025 change: a new electricity price from the middle of July. */
const CHANGE = "2025-07-15";

const dayNight = (day: string, night: string) => [
  { name: "Day", rate_per_kwh: day, windows: "Mon-Sun 07:00-23:00" },
  { name: "Night", rate_per_kwh: night, windows: "Mon-Sun 23:00-07:00" },
];

const climateLevy = [{ name: "Climate levy", rate_per_kwh: "0.00775" }];

function electricity(
  day: string,
  night: string,
  standing: string,
  maxDemand: string,
  exportRate: string | null,
): TariffRates {
  return {
    bands: dayNight(day, night),
    standing_charge_per_day: standing,
    capacity_charge_per_day: maxDemand === "0" ? "0" : "1.40",
    max_demand_rate_per_kw_month: maxDemand,
    levies: climateLevy,
    export_rate_per_kwh: exportRate,
    vat_percent: "20",
  };
}

function flat(rate: string, standing: string, vat = "20"): TariffRates {
  return {
    bands: [
      { name: "All hours", rate_per_kwh: rate, windows: "Mon-Sun 00:00-24:00" },
    ],
    standing_charge_per_day: standing,
    capacity_charge_per_day: "0",
    max_demand_rate_per_kw_month: "0",
    levies: [],
    export_rate_per_kwh: null,
    vat_percent: vat,
  };
}

/** The larger sites pay a maximum-demand charge and a capacity charge. */
const LARGE_SITES = new Set<string>([SITE.civicHall, SITE.pool, SITE.depot]);
/** The pool is paid for the solar power it exports. */
const EXPORT_PAID = new Set<string>([SITE.pool]);

/** Flat illustrative unit rate and standing charge per day, by carrier. */
const FLAT: Partial<Record<Carrier, [string, string]>> = {
  heat: ["0.0920", "0.95"],
  steam: ["0.0780", "1.10"],
  natural_gas: ["0.0610", "0.85"],
  cooling: ["0.1150", "0.40"],
  hydrogen: ["0.1900", "0.50"],
};

function electricityTariff(siteName: string): ScenarioTariff {
  const large = LARGE_SITES.has(siteName);
  const md = large ? "2.85" : "0";
  const exportRate = EXPORT_PAID.has(siteName) ? "0.0550" : null;
  return {
    siteName,
    carrier: "electricity",
    name: `${siteName} electricity (illustrative)`,
    versions: [
      {
        validFrom: FROM,
        rates: electricity(
          "0.2710",
          "0.1790",
          large ? "2.10" : "0.65",
          md,
          exportRate,
        ),
      },
      {
        validFrom: CHANGE,
        rates: electricity(
          "0.2485",
          "0.1640",
          large ? "2.25" : "0.70",
          md,
          exportRate,
        ),
      },
    ],
  };
}

function flatTariff(siteName: string, carrier: Carrier): ScenarioTariff {
  const [rate, standing] = FLAT[carrier] ?? ["0.1000", "0.50"];
  return {
    siteName,
    carrier,
    name: `${siteName} ${carrier.replace("_", " ")} (illustrative)`,
    versions: [{ validFrom: FROM, rates: flat(rate, standing) }],
  };
}

/** One tariff per site and carrier bought across the boundary: every demo supply is priced. */
export const SCENARIO_TARIFFS: readonly ScenarioTariff[] = [
  ...new Map(
    METERS.filter(
      (m) => !m.parentCode && (m.position ?? "boundary") === "boundary",
    ).map((m) => [`${m.siteName}|${m.carrier}`, m] as const),
  ).values(),
].map((m) =>
  m.carrier === "electricity"
    ? electricityTariff(m.siteName)
    : flatTariff(m.siteName, m.carrier),
);
