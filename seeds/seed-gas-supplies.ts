/**
 * The demo's gas supplies (seeds/scenario/gas-supplies.ts): a monthly CV
 * series for every natural-gas meter of the estate, and the register and
 * correction settings of its gas registers. Written with the estate, before
 * any reading arrives, so the readings find their CVs.
 */
import { calorificValues, gasMeterSettings } from "../app/db/schema";
import type { Executor } from "../app/db/client.server";
import { demoCvSeries, GAS_REGISTERS } from "./scenario/gas-supplies";
import { METERS } from "./scenario/larchmere-estate";

export async function seedGasSupplies(
  tx: Executor,
  organizationId: string,
  meterIds: ReadonlyMap<string, string>,
): Promise<void> {
  const supplies = METERS.filter(
    (m) => m.quantity === "gas_volume" && m.carrier === "natural_gas",
  );
  const series = demoCvSeries();
  for (const m of supplies) {
    await tx.insert(calorificValues).values(
      series.map(({ period, cv }) => ({
        organizationId,
        meterId: meterIds.get(m.code)!,
        periodKind: "month",
        periodStart: `${period}-01`,
        calorificValueMjM3: String(cv),
        basis: "gross",
        source: "Supplier's monthly statement (demo)",
      })),
    );
  }
  for (const [code, g] of Object.entries(GAS_REGISTERS)) {
    await tx.insert(gasMeterSettings).values({
      organizationId,
      meterId: meterIds.get(code)!,
      registerUnit: g.unit,
      gasTempC: String(g.gasTempC),
      gasPressureMbarG: String(g.gasPressureMbarG),
    });
  }
}
