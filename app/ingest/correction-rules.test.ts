import { describe, expect, it } from "vitest";
import {
  correctionHint,
  jumpMessage,
  spikeJump,
  wrongSignError,
  type CorrectedMeter,
} from "./correction-rules";
import type { IntervalPoint } from "./series";
import { expectedSign } from "./validate";

const at = (h: number) => new Date(Date.UTC(2026, 2, 10, h));
const measured = (values: number[]): IntervalPoint[] =>
  values.map((energyKwh, h) => ({
    intervalStart: at(h),
    energyKwh,
    quality: "measured",
  }));

const heatIn: CorrectedMeter = {
  code: "HM-1",
  carrier: "heat",
  orientation: "import",
  spikeFactor: 10,
};
const solarOut: CorrectedMeter = {
  code: "PV-1",
  carrier: "electricity",
  orientation: "export",
  spikeFactor: 10,
};
const chilledIn: CorrectedMeter = {
  code: "CH-1",
  carrier: "cooling",
  orientation: "import",
  spikeFactor: 10,
};

describe("expectedSign", () => {
  it("is + for energy delivered, − for exported, flipped again for chilled water", () => {
    expect(expectedSign(heatIn)).toBe(1);
    expect(expectedSign(solarOut)).toBe(-1);
    expect(expectedSign(chilledIn)).toBe(-1);
    expect(expectedSign({ carrier: "cooling", orientation: "export" })).toBe(1);
  });
});

describe("wrongSignError", () => {
  it("refuses −500 kWh on an import meter and names the value to enter", () => {
    expect(wrongSignError(heatIn, -500)).toBe(
      "HM-1 records heat delivered to the site, which the ledger counts as positive kWh (or 0): −500 kWh has the wrong sign. If 500 kWh was delivered, enter 500.",
    );
  });

  it("refuses a positive hour on an export meter and on chilled water", () => {
    expect(wrongSignError(solarOut, 30)).toMatch(
      /exported from the site, .* negative kWh .* If 30 kWh was exported, enter −30\.$/,
    );
    expect(wrongSignError(chilledIn, 12.5)).toMatch(/enter −12\.5\.$/);
  });

  it("takes the right sign and zero on every meter", () => {
    expect(wrongSignError(heatIn, 42)).toBeNull();
    expect(wrongSignError(solarOut, -42)).toBeNull();
    expect(wrongSignError(chilledIn, -42)).toBeNull();
    for (const meter of [heatIn, solarOut, chilledIn])
      expect(wrongSignError(meter, 0)).toBeNull();
  });
});

describe("spikeJump", () => {
  // Hour 3 (900 kWh) is the one corrected. The typical interval of the others:
  // median of 3, 4, 5 = 4 kWh; the limit is 10 × 4 = 40 kWh.
  const history = measured([3, 4, 5, 900]);

  it("is null up to the spike factor × the typical hour, as ingest's rule", () => {
    expect(spikeJump(heatIn, 40, history, at(3))).toBeNull();
    expect(spikeJump(heatIn, 40.001, history, at(3))).toMatchObject({
      typicalIntervalKwh: 4,
      spikeFactor: 10,
    });
  });

  it("leaves out the hour being corrected: its old value is being replaced", () => {
    // With the 900 kWh hour counted, the median would be (4 + 5) / 2.
    expect(spikeJump(heatIn, 1e9, history, at(3))).toEqual({
      typicalIntervalKwh: 4,
      timesTypical: 250_000_000,
      spikeFactor: 10,
    });
  });

  it("is null with no non-zero actual reading to compare with", () => {
    expect(spikeJump(heatIn, 1e9, measured([0, 0]), at(5))).toBeNull();
    expect(spikeJump(heatIn, 1e9, [], at(5))).toBeNull();
  });

  it("names the jump in the message", () => {
    const jump = spikeJump(heatIn, 1e9, history, at(3))!;
    expect(jumpMessage(1e9, jump)).toBe(
      "1,000,000,000 kWh is 250,000,000 × this meter's typical interval of 4.0 kWh; intervals above 10 × are flagged as spikes. Confirm the value to save it.",
    );
    const small = spikeJump(heatIn, 45, history, at(3))!;
    expect(jumpMessage(45, small)).toMatch(/^45 kWh is 11\.3 × /);
  });
});

describe("correctionHint", () => {
  it("says what the meter's hours are and how to sign them", () => {
    expect(correctionHint(heatIn)).toBe(
      "Heat delivered to the site: enter a positive number of kWh (or 0).",
    );
    expect(correctionHint(solarOut)).toBe(
      "Electricity exported from the site, which the ledger counts as negative kWh: enter −12.5 for 12.5 kWh.",
    );
    expect(correctionHint(chilledIn)).toMatch(/\(heat taken out\)/);
  });
});
