/**
 * The one source of the carriers' colours: badges, every chart, the site's
 * boundary and balance diagrams and the report PDF take them from here, so a
 * carrier looks the same wherever it appears. Copper for heat and a clear
 * blue for cooling follow app/app.css; steam is a violet and electricity an
 * ochre. Plain module.
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
