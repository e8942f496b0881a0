import { degreeDayLabel, driverLabels } from "~/baselines/degree-days";
import type { AnalysisView } from "~/baselines/weather-page.server";
import { BrowserOnly } from "~/components/browser-only";
import { FigureTable } from "~/components/figure-table";
import { SectionCard } from "~/components/section-card";
import { DegreeDayChart } from "~/components/weather/weather-charts";
import {
  DECIMALS,
  formatNumber,
  formatPercent,
  monthShort,
  NO_FIGURE,
} from "~/lib/format";
import { carrierLabels } from "~/sites/meter-kinds";
import type { Carrier } from "~/sites/meter-kinds";

/** A card of one analysis of a site and carrier. */
export interface AnalysisCardProps {
  carrier: Carrier | null;
  analysis: AnalysisView;
}

/** The months of both periods: a chart, and the figures in a table below it. */
export function DegreeDaysByMonth({ carrier, analysis }: AnalysisCardProps) {
  return (
    <SectionCard
      headingId="months-heading"
      title="Degree days and energy by month"
    >
      <BrowserOnly>
        <DegreeDayChart
          carrier={carrier}
          months={analysis.months}
          ddLabel={driverLabels[analysis.driver]}
          energyLabel={carrier ? `${carrierLabels[carrier]} energy` : "Energy"}
          baseline={analysis.baseline}
          reporting={analysis.reporting}
        />
      </BrowserOnly>
      <details className="mt-3">
        <summary className="cursor-pointer font-semibold text-spruce-700">
          Figures by month
        </summary>
        <div className="mt-2">
          <MonthTable analysis={analysis} />
        </div>
      </details>
    </SectionCard>
  );
}

function MonthTable({ analysis }: { analysis: AnalysisView }) {
  const inPeriod = (month: string) =>
    month >= analysis.baseline.from && month <= analysis.baseline.to
      ? "Baseline"
      : month >= analysis.reporting.from && month <= analysis.reporting.to
        ? "Reporting"
        : "";
  return (
    <FigureTable
      bordered
      maxHeight="max-h-96"
      caption="Monthly degree days and energy"
      columns={[
        { label: "Month" },
        { label: "Period" },
        { label: "Weather days", align: "right" },
        { label: degreeDayLabel("hdd", analysis.baseC), align: "right" },
        { label: degreeDayLabel("cdd", analysis.baseC), align: "right" },
        { label: "Energy (kWh)", align: "right" },
        { label: "Estimated", align: "right" },
        { label: "Note" },
      ]}
    >
      {analysis.months.map((m) => (
        <tr
          key={m.month}
          data-month={m.month}
          className="border-t border-line tabular-nums"
        >
          <td className="px-2 py-1">{monthShort(m.month)}</td>
          <td className="px-2 py-1">{inPeriod(m.month)}</td>
          <td className="px-2 py-1 text-right">
            {`${m.weatherDays}/${m.daysInMonth}`}
          </td>
          <td className="px-2 py-1 text-right" data-hdd={m.hdd.toFixed(2)}>
            {formatNumber(m.hdd, DECIMALS.degreeDays, { fixed: true })}
          </td>
          <td className="px-2 py-1 text-right" data-cdd={m.cdd.toFixed(2)}>
            {formatNumber(m.cdd, DECIMALS.degreeDays, { fixed: true })}
          </td>
          <td className="px-2 py-1 text-right">
            {formatNumber(m.kwh, DECIMALS.kWh)}
          </td>
          <td className="px-2 py-1 text-right">
            {m.kwh ? formatPercent(m.estimatedKwh / m.kwh) : NO_FIGURE}
          </td>
          <td className="px-2 py-1 text-ink-muted">{m.note ?? ""}</td>
        </tr>
      ))}
    </FigureTable>
  );
}
