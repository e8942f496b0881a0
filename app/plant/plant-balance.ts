/**
 * The site's balance with its plant (pure): fuel → plant → heat and
 * electricity → uses and losses. balance.ts draws what crosses the boundary
 * straight into the site; here a plant's input meters flow into the plant
 * instead, and the plant into its output meters (inside the boundary) and
 * on into the site, with the conversion loss (fuel − outputs) as a flow of
 * its own.
 *
 * Every flow stays in its own carrier and keeps its own figure; the plant
 * node shows no total, because fuel, heat and electricity are not one kind
 * of kWh to add. A heat pump's heat beyond its electricity comes from the
 * outdoor air, which no meter measures: it is drawn by difference and named
 * so. A month that broke a law (plant-performance.ts) is a meter's fault:
 * its loss is not drawn.
 *
 * A plant is drawn only when its input meters cross the boundary (their flow
 * into the site is there to redirect) and its output meters are not already
 * drawn; otherwise it stays listed beside the diagram.
 */
import type {
  BalanceDiagram,
  BalanceLink,
  BalanceMeter,
  BalanceNode,
} from "~/ledger/balance";
import type { Carrier } from "~/sites/meter-kinds";
import type { PlantKind, PlantMeterRole } from "./plant-roles";

export interface PlantFlow {
  plantId: string;
  name: string;
  kind: PlantKind;
  meters: { meterId: string; role: PlantMeterRole; carrier: Carrier }[];
  /** The month's energy per role, kWh, as magnitudes. */
  energies: Partial<Record<PlantMeterRole, number>>;
  /** The month broke a law: a meter is at fault. */
  fault: boolean;
}

const INPUTS: readonly PlantMeterRole[] = ["fuel_in", "electricity_in"];
const BURNS_FUEL: readonly PlantKind[] = ["boiler", "chp", "fuel_cell"];

/** Draws each plant it can into a copy of `diagram`; returns the plants drawn. */
export function withPlant(
  diagram: BalanceDiagram,
  plants: readonly PlantFlow[],
  meters: readonly BalanceMeter[],
): BalanceDiagram & { drawn: string[] } {
  const nodes: BalanceNode[] = diagram.nodes.map((n) => ({ ...n }));
  const links: BalanceLink[] = diagram.links.map((l) => ({ ...l }));
  const drawn: string[] = [];
  const nodeOf = (meterId: string) =>
    nodes.findIndex((n) => n.meterId === meterId);
  for (const plant of plants) {
    const inputs = plant.meters.filter((m) => INPUTS.includes(m.role));
    const outputs = plant.meters.filter((m) => !INPUTS.includes(m.role));
    const intoSite = inputs.map((m) =>
      links.findIndex(
        (l) =>
          l.target === diagram.site && nodes[l.source].meterId === m.meterId,
      ),
    );
    if (inputs.length === 0 || intoSite.some((i) => i < 0)) continue;
    if (outputs.some((m) => nodeOf(m.meterId) >= 0)) continue;
    const plantNode =
      nodes.push({
        name: plant.fault ? `${plant.name}: metering fault` : plant.name,
        kind: "plant",
        carrier: null,
        signedKwh: 0,
      }) - 1;
    for (const i of intoSite) links[i].target = plantNode;
    const add = (
      source: number,
      target: number,
      kwh: number,
      carrier: Carrier,
      loss = false,
    ) => {
      if (kwh > 0)
        links.push({
          source,
          target,
          value: kwh,
          signedKwh: kwh,
          carrier,
          loss,
        });
    };
    let outputsKwh = 0;
    for (const out of outputs) {
      const kwh = plant.energies[out.role] ?? 0;
      outputsKwh += kwh;
      const meter = meters.find((m) => m.id === out.meterId);
      const outNode =
        nodes.push({
          name: meter ? `${meter.code} · ${meter.name}` : out.role,
          kind: "meter",
          carrier: out.carrier,
          signedKwh: meter ? Number(meter.energyKwh) : kwh,
          meterId: out.meterId,
        }) - 1;
      add(plantNode, outNode, kwh, out.carrier);
      add(outNode, diagram.site, kwh, out.carrier);
    }
    const fuel = inputs.find((m) => m.role === "fuel_in");
    const lossKwh = (plant.energies.fuel_in ?? 0) - outputsKwh;
    if (
      fuel &&
      BURNS_FUEL.includes(plant.kind) &&
      !plant.fault &&
      lossKwh > 0
    ) {
      const lossNode =
        nodes.push({
          name: "Conversion loss",
          kind: "loss",
          carrier: fuel.carrier,
          signedKwh: lossKwh,
        }) - 1;
      add(plantNode, lossNode, lossKwh, fuel.carrier, true);
    }
    const fromAir =
      (plant.energies.heat_out ?? 0) - (plant.energies.electricity_in ?? 0);
    if (plant.kind === "heat_pump" && fromAir > 0) {
      const airNode =
        nodes.push({
          name: "Outdoor air (by difference)",
          kind: "ambient",
          carrier: "heat",
          signedKwh: fromAir,
        }) - 1;
      add(airNode, plantNode, fromAir, "heat");
    }
    drawn.push(plant.plantId);
  }
  return { ...diagram, nodes, links, drawn };
}
