/**
 * The ink, grid and accent colours every chart draws with, the app's own
 * palette (app/app.css) as plain values, since SVG attributes take no CSS
 * custom properties in every browser. Carriers' colours live in
 * app/sites/carrier-colours.ts.
 */
export const CHART = {
  ink: "#4f5966",
  inkStrong: "#1a222d",
  grid: "#dcd6ca",
  spruce: "#0f5546",
  danger: "#b3261e",
} as const;
