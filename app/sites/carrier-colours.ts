/**
 * The one source of the carriers' colours: badges, every chart, the site's
 * boundary and balance diagrams and the report PDF take them from here, so a
 * carrier looks the same wherever it appears. Copper for heat and a clear
 * blue for cooling follow app/app.css; steam is a violet and electricity an
 * ochre. The fuels take the hues left between them: a teal for natural gas,
 * a raspberry for LPG, an umber for gas oil, an olive for kerosene, a leaf
 * green for biomass and a plum for hydrogen, each at least ΔE 20 (CIE 1976)
 * from every other carrier's (carrier-colours.test.ts). Plain module.
 *
 * - `chart`: bars, lines, arrows and the badge's swatch; at least 4.5:1
 *   against white and against `tint`.
 * - `tint` and `ink`: a badge's background and text, at least 6.5:1.
 */
import type { Carrier } from "./meter-kinds";

export interface CarrierColour {
  chart: string;
  tint: string;
  ink: string;
}

export const carrierColours: Record<Carrier, CarrierColour> = {
  heat: { chart: "#a9501f", tint: "#fbf0e8", ink: "#8a3f16" },
  cooling: { chart: "#255f9e", tint: "#eaf2fb", ink: "#1c4c80" },
  steam: { chart: "#6a4a9c", tint: "#f1ecf8", ink: "#55397f" },
  electricity: { chart: "#7a5d00", tint: "#f8f2da", ink: "#5c4600" },
  natural_gas: { chart: "#0b6c7c", tint: "#e6f4f6", ink: "#08525e" },
  lpg: { chart: "#ad2f5a", tint: "#fbecf1", ink: "#8c2448" },
  gas_oil: { chart: "#6b5846", tint: "#f3efea", ink: "#52422f" },
  kerosene: { chart: "#5a6a12", tint: "#f1f4e0", ink: "#445010" },
  biomass: { chart: "#2f7a34", tint: "#ebf5ea", ink: "#235c27" },
  hydrogen: { chart: "#94308c", tint: "#f8ebf6", ink: "#742570" },
};

/** A carrier's chart colour. */
export function carrierColour(carrier: Carrier): string {
  return carrierColours[carrier].chart;
}

/** How much white an exported bar takes: light, yet visible on the page. */
const EXPORT_MIX = 0.55;

/**
 * Exported energy of a carrier in charts: its colour mixed with white, so a
 * legend swatch (which ignores a bar's opacity) tells it from delivered.
 */
export function carrierExportColour(carrier: Carrier): string {
  const hex = carrierColours[carrier].chart;
  const mixed = [1, 3, 5].map((i) => {
    const channel = parseInt(hex.slice(i, i + 2), 16);
    return Math.round(channel + (255 - channel) * EXPORT_MIX)
      .toString(16)
      .padStart(2, "0");
  });
  return `#${mixed.join("")}`;
}
