/**
 * The report's look, from the app's own theme (app/app.css): warm paper,
 * dark ink, deep spruce for the product, copper for heat, a clear blue for
 * cooling. Sizes are PDF points (1/72 in).
 */
import { carrierColour } from "~/sites/carrier-colours";
import { carriers } from "~/sites/meter-kinds";
import type { Carrier } from "../data/types";

export const colours = {
  paper: "#f5f3ee",
  surface: "#ffffff",
  sunken: "#ece8df",
  line: "#dcd6ca",
  lineStrong: "#b9b1a2",
  ink: "#1a222d",
  inkMuted: "#4f5966",
  inkFaint: "#6b7380",
  spruce50: "#e9f3ef",
  spruce100: "#cfe5dc",
  spruce600: "#17695a",
  spruce700: "#0f5546",
  spruce800: "#0b4238",
  spruce900: "#08302a",
  copper600: "#a9501f",
  frost600: "#255f9e",
  danger600: "#b3261e",
  caution50: "#fdf4e3",
  caution700: "#7a4b00",
} as const;

/** The carriers' colours, the app's own (app/sites/carrier-colours.ts). */
export const carrierColours = Object.fromEntries(
  carriers.map((c) => [c, carrierColour(c)]),
) as Record<Carrier, string>;

/** A4 portrait, with room above and below for the running header and footer. */
export const page = {
  size: "A4",
  width: 595.28,
  height: 841.89,
  margins: { top: 62, bottom: 58, left: 50, right: 50 },
} as const;

export const contentWidth = page.width - page.margins.left - page.margins.right;

export const type = {
  body: 9.5,
  small: 8,
  table: 8.2,
  h1: 18,
  h2: 13,
  h3: 10.5,
} as const;
