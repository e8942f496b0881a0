// A plant's month against the laws: the bounds must catch an impossible
// month and pass a plausible one. Plausible figures are common practice
// (a gas boiler 80–95 % gross, an air-source heat pump COP 2.5–4).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { carnotHeatingCop, meanTemperatureK } from "./carnot";
import {
  failedChecks,
  plantPerformance,
  type PlantFigureKey,
  type PlantMonth,
} from "./plant-performance";

const figure = (month: PlantMonth, key: PlantFigureKey) =>
  plantPerformance(month).figures.find((f) => f.key === key)?.value;

const gasBoiler = (
  heatOutKwh: number,
  basis: "gross" | "net" = "gross",
): PlantMonth => ({
  kind: "boiler",
  fuel: { fuel: "natural_gas", energyKwh: 10_000, basis },
  heatOutKwh,
  temperatures: { outdoorC: 5, heatFlowC: 75, heatReturnC: 55 },
});

describe("boilers", () => {
  it("a month at 88 % gross passes", () => {
    const month = gasBoiler(8_800);
    expect(figure(month, "efficiency_gross")).toBeCloseTo(0.88, 12);
    expect(failedChecks(plantPerformance(month))).toEqual([]);
  });

  it("a month above 100 % gross is a fault, whatever the heat meter says", () => {
    const failed = failedChecks(plantPerformance(gasBoiler(10_400)));
    expect(failed).toHaveLength(1);
    expect(failed[0]).toMatchObject({ figure: "efficiency_gross", limit: 1 });
    expect(failed[0]!.measured).toBeCloseTo(1.04, 12);
  });

  it("105 % on a net basis is a condensing boiler, not a fault (≈ 94.6 % gross)", () => {
    const month = gasBoiler(10_500, "net");
    expect(figure(month, "efficiency_gross")).toBeCloseTo(1.05 * 0.9011, 3);
    expect(failedChecks(plantPerformance(month))).toEqual([]);
  });

  it("its second-law efficiency is far below its first-law one: heat at 65 °C is worth little work", () => {
    const month = gasBoiler(8_800);
    const second = figure(month, "second_law_efficiency")!;
    expect(second).toBeGreaterThan(0.1);
    expect(second).toBeLessThan(0.25);
  });

  it("has no figures in a month with no fuel (no data, not zero)", () => {
    const month: PlantMonth = { ...gasBoiler(100), fuel: undefined };
    expect(figure(month, "efficiency_gross")).toBeNull();
    expect(plantPerformance(month).checks).toEqual([]);
  });
});

const hydrogenCell = (
  electricityOutKwh: number,
  heatOutKwh: number,
): PlantMonth => ({
  kind: "fuel_cell",
  fuel: { fuel: "hydrogen", energyKwh: 1_000, basis: "gross" },
  electricityOutKwh,
  heatOutKwh,
  temperatures: { outdoorC: 10, heatFlowC: 60, heatReturnC: 40 },
});

describe("fuel cells and CHP", () => {
  it("50 % electrical and 35 % heat on hydrogen passes", () => {
    expect(failedChecks(plantPerformance(hydrogenCell(500, 350)))).toEqual([]);
  });

  it("electricity beyond |ΔG| (83.0 % of gross for hydrogen) is a fault", () => {
    const failed = failedChecks(plantPerformance(hydrogenCell(850, 0)));
    expect(failed.map((c) => c.figure)).toEqual([
      "electrical_efficiency_gross",
    ]);
    expect(failed[0]!.limit).toBeCloseTo(0.8297, 4);
  });

  it("electricity plus heat beyond the fuel's gross energy is a fault", () => {
    const failed = failedChecks(plantPerformance(hydrogenCell(500, 550)));
    expect(failed.map((c) => c.figure)).toEqual(["efficiency_gross"]);
  });

  it("a gas engine CHP is bounded by methane's ΔG share (≈ 91.9 % of gross)", () => {
    const month: PlantMonth = {
      kind: "chp",
      fuel: { fuel: "natural_gas", energyKwh: 1_000, basis: "gross" },
      electricityOutKwh: 350,
      heatOutKwh: 450,
      temperatures: { outdoorC: 10, heatFlowC: 80, heatReturnC: 60 },
    };
    const perf = plantPerformance(month);
    expect(failedChecks(perf)).toEqual([]);
    const bound = perf.checks.find(
      (c) => c.figure === "electrical_efficiency_gross",
    );
    expect(bound!.limit).toBeCloseTo(817.9 / 890.3, 3);
  });
});

const airSourceHeatPump = (cop: number): PlantMonth => ({
  kind: "heat_pump",
  electricityInKwh: 1_000,
  heatOutKwh: 1_000 * cop,
  temperatures: { outdoorC: 5, heatFlowC: 35, heatReturnC: 30 },
});

describe("heat pumps and chillers", () => {
  it("a COP of 3.2 at 5 °C outdoors into 35/30 °C water passes", () => {
    expect(figure(airSourceHeatPump(3.2), "cop")).toBeCloseTo(3.2, 12);
    expect(failedChecks(plantPerformance(airSourceHeatPump(3.2)))).toEqual([]);
  });

  it("a COP above the month's Carnot COP (≈ 11.1) is a fault", () => {
    const failed = failedChecks(plantPerformance(airSourceHeatPump(12)));
    expect(failed).toHaveLength(1);
    const tm = meanTemperatureK(35, 30);
    expect(failed[0]!.limit).toBeCloseTo(tm / (tm - 278.15), 9);
    expect(failed[0]!.limit).toBeCloseTo(carnotHeatingCop(32.5, 5), 1);
  });

  it("the Carnot check and a second-law efficiency above 1 agree (outdoor air is source and dead state)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 20, noNaN: true }), (cop) => {
        const perf = plantPerformance(airSourceHeatPump(cop));
        const second = perf.figures.find(
          (f) => f.key === "second_law_efficiency",
        )!.value!;
        if (Math.abs(second - 1) < 1e-9) return true;
        return failedChecks(perf).length > 0 === second > 1;
      }),
    );
  });

  it("a chiller with an EER of 4 at 7/12 °C and 30 °C outdoors passes; 25 does not", () => {
    const chiller = (eer: number): PlantMonth => ({
      kind: "chiller",
      electricityInKwh: 100,
      coolingOutKwh: 100 * eer,
      temperatures: { outdoorC: 30, chilledFlowC: 7, chilledReturnC: 12 },
    });
    expect(failedChecks(plantPerformance(chiller(4)))).toEqual([]);
    expect(
      failedChecks(plantPerformance(chiller(25))).map((c) => c.figure),
    ).toEqual(["eer"]);
  });
});

describe("a month without weather", () => {
  it("still shows the COP but leaves the Carnot check and the exergy out", () => {
    const month: PlantMonth = {
      ...airSourceHeatPump(12),
      temperatures: { heatFlowC: 35, heatReturnC: 30 },
    };
    const perf = plantPerformance(month);
    expect(figure(month, "cop")).toBeCloseTo(12, 12);
    expect(figure(month, "second_law_efficiency")).toBeNull();
    expect(perf.checks).toEqual([]);
  });
});
