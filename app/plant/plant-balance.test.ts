import { describe, expect, it } from "vitest";
import { balanceDiagram, type BalanceMeter } from "~/ledger/balance";
import { withPlant, type PlantFlow } from "./plant-balance";

function meter(
  id: string,
  energyKwh: string,
  extra: Partial<BalanceMeter>,
): BalanceMeter {
  return {
    id,
    code: id.toUpperCase(),
    name: `Meter ${id}`,
    carrier: "heat",
    orientation: "import",
    parentMeterId: null,
    position: "boundary",
    retired: false,
    energyKwh,
    estimatedKwh: "0",
    ...extra,
  };
}

const gas = meter("gas", "1000", { carrier: "natural_gas" });
const heat = meter("heat", "850", { position: "internal" });
const power = meter("power", "300", { carrier: "electricity" });
const pumpHeat = meter("pumpheat", "960", { position: "internal" });
const METERS = [gas, heat, power, pumpHeat];

function diagramOf(plants: PlantFlow[]) {
  const base = balanceDiagram(
    { meters: METERS, parents: [], netKwh: "0" },
    "Depot",
  );
  return withPlant(base, plants, METERS);
}

const boiler: PlantFlow = {
  plantId: "b",
  name: "Boiler house",
  kind: "boiler",
  meters: [
    { meterId: "gas", role: "fuel_in", carrier: "natural_gas" },
    { meterId: "heat", role: "heat_out", carrier: "heat" },
  ],
  energies: { fuel_in: 1000, heat_out: 850 },
  fault: false,
};

const heatPump: PlantFlow = {
  plantId: "hp",
  name: "Heat pump",
  kind: "heat_pump",
  meters: [
    { meterId: "power", role: "electricity_in", carrier: "electricity" },
    { meterId: "pumpheat", role: "heat_out", carrier: "heat" },
  ],
  energies: { electricity_in: 300, heat_out: 960 },
  fault: false,
};

const named = (d: ReturnType<typeof diagramOf>, i: number) => d.nodes[i].name;
const flows = (d: ReturnType<typeof diagramOf>) =>
  d.links.map((l) => [
    named(d, l.source),
    named(d, l.target),
    l.value,
    l.carrier,
  ]);

describe("the site's balance with its plant", () => {
  it("runs fuel → boiler → heat meter → site, with the conversion loss apart", () => {
    const d = diagramOf([boiler]);
    expect(d.drawn).toEqual(["b"]);
    const f = flows(d);
    expect(f).toContainEqual([
      "GAS · Meter gas",
      "Boiler house",
      1000,
      "natural_gas",
    ]);
    expect(f).toContainEqual([
      "Boiler house",
      "HEAT · Meter heat",
      850,
      "heat",
    ]);
    expect(f).toContainEqual(["HEAT · Meter heat", "Depot", 850, "heat"]);
    expect(f).toContainEqual([
      "Boiler house",
      "Conversion loss",
      150,
      "natural_gas",
    ]);
    // The gas no longer flows straight into the site.
    expect(f).not.toContainEqual([
      "GAS · Meter gas",
      "Depot",
      1000,
      "natural_gas",
    ]);
    const loss = d.links.find((l) => l.loss);
    expect(loss?.value).toBe(150);
  });

  it("draws no loss for a month at fault, and names the fault", () => {
    const d = diagramOf([
      { ...boiler, fault: true, energies: { fuel_in: 1000, heat_out: 1100 } },
    ]);
    expect(d.links.some((l) => l.loss)).toBe(false);
    expect(d.nodes.map((n) => n.name)).toContain(
      "Boiler house: metering fault",
    );
  });

  it("gives a heat pump its outdoor-air heat by difference", () => {
    const d = diagramOf([heatPump]);
    expect(flows(d)).toContainEqual([
      "Outdoor air (by difference)",
      "Heat pump",
      660,
      "heat",
    ]);
    expect(d.links.some((l) => l.loss)).toBe(false);
  });

  it("leaves a plant out when its input does not cross the boundary", () => {
    const internalGas = {
      ...boiler,
      meters: [
        {
          meterId: "nowhere",
          role: "fuel_in" as const,
          carrier: "natural_gas" as const,
        },
        boiler.meters[1],
      ],
    };
    const d = diagramOf([internalGas]);
    expect(d.drawn).toEqual([]);
    expect(d.nodes.some((n) => n.kind === "plant")).toBe(false);
  });
});
