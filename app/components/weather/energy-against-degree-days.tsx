import { driverLabels } from "~/baselines/degree-days";
import { SectionCard } from "~/components/section-card";
import type { AnalysisCardProps } from "~/components/weather/degree-days-by-month";
import {
  BaselineScatter,
  SCATTER_HEIGHT,
} from "~/components/weather/weather-charts";
import { WhenInView } from "~/components/when-in-view";

/** Each month's energy against its degree days, with the baseline model's line. */
export function EnergyAgainstDegreeDays({
  carrier,
  analysis,
}: AnalysisCardProps) {
  return (
    <SectionCard headingId="scatter-heading" title="Energy against degree days">
      {/* Below the fold on a laptop's screen: drawn as it is scrolled to. */}
      <WhenInView height={SCATTER_HEIGHT}>
        <BaselineScatter
          carrier={carrier}
          baseline={analysis.basePoints}
          reporting={analysis.reportPoints}
          line={analysis.model}
          ddLabel={driverLabels[analysis.driver]}
        />
      </WhenInView>
    </SectionCard>
  );
}
