import { driverLabels } from "~/baselines/degree-days";
import type { AnalysisView, SiteView } from "~/baselines/weather-page.server";
import { SectionCard } from "~/components/section-card";
import { BaselineScatter } from "~/components/weather/weather-charts";
import { useHydrated } from "~/lib/use-hydrated";

/** Each month's energy against its degree days, with the baseline model's line. */
export function EnergyAgainstDegreeDays({
  view,
  analysis,
}: {
  view: SiteView;
  analysis: AnalysisView;
}) {
  // Charts measure the page, so they render in the browser only.
  const mounted = useHydrated();
  return (
    <SectionCard id="scatter" title="Energy against degree days">
      {mounted ? (
        <BaselineScatter
          carrier={view.carrier}
          baseline={analysis.basePoints}
          reporting={analysis.reportPoints}
          line={analysis.model}
          ddLabel={driverLabels[analysis.driver]}
        />
      ) : null}
    </SectionCard>
  );
}
