import { driverLabels } from "~/baselines/degree-days";
import { BrowserOnly } from "~/components/browser-only";
import { SectionCard } from "~/components/section-card";
import type { AnalysisCardProps } from "~/components/weather/degree-days-by-month";
import { BaselineScatter } from "~/components/weather/weather-charts";

/** Each month's energy against its degree days, with the baseline model's line. */
export function EnergyAgainstDegreeDays({
  carrier,
  analysis,
}: AnalysisCardProps) {
  return (
    <SectionCard headingId="scatter-heading" title="Energy against degree days">
      <BrowserOnly>
        <BaselineScatter
          carrier={carrier}
          baseline={analysis.basePoints}
          reporting={analysis.reportPoints}
          line={analysis.model}
          ddLabel={driverLabels[analysis.driver]}
        />
      </BrowserOnly>
    </SectionCard>
  );
}
