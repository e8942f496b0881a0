// Biomass by weight (solid_fuel): the evaluate item, the dry-to-as-received
// CV (EN ISO 18125's relations) and the ranges, through the API's item path.

import { describe, expect, it } from "vitest";
import { parseReading } from "../ingest/reading-schema";
import { carriersFor } from "../sites/meter-kinds";
import { evaluateItem } from "./evaluate";
import type { EvaluateResult } from "./evaluate";
import { expectRelativeClose } from "./test-helpers";

function okResult(r: EvaluateResult) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error}`);
  return r;
}

function errorOf(r: EvaluateResult): string {
  if (r.ok) throw new Error(`expected a rejection, got ${r.energy_kwh} kWh`);
  return r.error;
}

const PELLETS = {
  quantity: "solid_fuel",
  mass_kg: 62,
  calorific_value_mj_kg: 17.1,
  cv_basis: "net",
} as const;

describe("solid_fuel", () => {
  it("is m × CV / 3.6 for an as-received CV, the default", () => {
    const r = okResult(evaluateItem(PELLETS));
    // 62 kg × 17.1 MJ/kg = 1060.2 MJ = 294.5 kWh.
    expectRelativeClose(r.energy_kwh, 294.5, 1e-14);
    expect(r.method).toBe("declared-cv/solid-fuel");
    expect(r.details).toMatchObject({
      cv_basis: "net",
      cv_moisture_basis: "as_received",
      as_received_cv_mj_kg: 17.1,
      moisture_percent: null,
      dry_mass_kg: null,
    });
  });

  it("dilutes a dry gross CV by the moisture, and takes the water's latent heat off a net one", () => {
    const gross = okResult(
      evaluateItem({
        quantity: "solid_fuel",
        mass_kg: 100,
        calorific_value_mj_kg: 20,
        cv_moisture_basis: "dry",
        moisture_percent: 25,
      }),
    );
    // 20 × (1 − 0.25) = 15 MJ/kg; 100 kg → 1500 MJ; 75 kg of dry matter.
    expectRelativeClose(gross.energy_kwh, 1500 / 3.6, 1e-14);
    expect(gross.details.dry_mass_kg).toBe(75);
    const net = okResult(
      evaluateItem({
        quantity: "solid_fuel",
        mass_kg: 100,
        calorific_value_mj_kg: 18.5,
        cv_basis: "net",
        cv_moisture_basis: "dry",
        moisture_percent: 30,
      }),
    );
    // 18.5 × 0.7 − 0.02443 × 30 = 12.95 − 0.7329 = 12.2171 MJ/kg.
    expectRelativeClose(
      net.details.as_received_cv_mj_kg as number,
      12.2171,
      1e-12,
    );
    expectRelativeClose(net.energy_kwh, 1221.71 / 3.6, 1e-12);
  });

  it.each([
    [
      { ...PELLETS, calorific_value_mj_kg: 4.8 },
      "calorific_value_mj_kg: 4.8 MJ/kg is outside 5 MJ/kg to 35 MJ/kg",
    ],
    [
      { ...PELLETS, moisture_percent: 80 },
      "moisture_percent: 80 % is outside 0 % to 70 %",
    ],
    [
      { ...PELLETS, cv_moisture_basis: "dry" },
      "moisture_percent: is required when the CV is per kg of dry matter",
    ],
    [{ ...PELLETS, mass_kg: -1 }, "mass_kg: must be at least 0, got -1"],
    [
      {
        ...PELLETS,
        calorific_value_mj_kg: 5,
        cv_moisture_basis: "dry",
        moisture_percent: 70,
      },
      "moisture_percent: at 70 % moisture gives a net CV as received of",
    ],
    [{ ...PELLETS, volume_l: 3 }, "volume_l: unknown field"],
  ])("refuses %j naming the field and the range", (item, reason) => {
    expect(errorOf(evaluateItem(item))).toContain(reason);
  });

  it("is a reading a biomass meter can send", () => {
    expect(carriersFor.solid_fuel).toEqual(["biomass"]);
    const parsed = parseReading({
      ...PELLETS,
      meter: "BH-BM1",
      start: "2026-04-14T00:00:00Z",
      end: "2026-04-14T01:00:00Z",
    });
    expect(parsed.ok).toBe(true);
  });
});
