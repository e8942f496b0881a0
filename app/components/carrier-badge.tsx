import { carrierColours } from "~/sites/carrier-colours";
import { carrierLabels, type Carrier } from "~/sites/meter-kinds";

/**
 * A carrier's name in its own colours: the swatch is the colour its series
 * has in every chart, so a badge reads as the legend of the charts beside it.
 */
export function CarrierBadge({ carrier }: { carrier: Carrier }) {
  const colour = carrierColours[carrier];
  return (
    <span
      data-carrier={carrier}
      className="inline-flex items-center gap-1.5 whitespace-nowrap rounded-full px-2.5 py-0.5 text-sm font-semibold"
      style={{ backgroundColor: colour.tint, color: colour.ink }}
    >
      <span
        aria-hidden="true"
        data-swatch
        className="h-2.5 w-2.5 shrink-0 rounded-full"
        style={{ backgroundColor: colour.chart }}
      />
      {carrierLabels[carrier]}
    </span>
  );
}
