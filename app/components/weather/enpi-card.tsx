import { degreeDayLabel } from "~/baselines/degree-days";
import type { AnalysisView, SiteView } from "~/baselines/weather-page.server";
import { FigureTable } from "~/components/figure-table";
import { SectionCard } from "~/components/section-card";
import { DECIMALS, formatArea, formatNumber, monthShort } from "~/lib/format";

/** Ratio energy performance indicators of the baseline and reporting periods. */
export function EnpiCard({
  analysis,
  view,
}: {
  analysis: AnalysisView;
  view: SiteView;
}) {
  const rows = [
    ["Baseline period", analysis.baseline, analysis.enpis.baseline],
    ["Reporting period", analysis.reporting, analysis.enpis.reporting],
  ] as const;
  return (
    <SectionCard headingId="enpi-heading" title="Energy performance indicators">
      <p className="mt-1 text-ink-muted">
        Ratio EnPIs in the sense of ISO 50006 over the months counted; the
        regression above is the statistical EnPI. Energy per degree day includes
        the base load, so it falls as degree days rise.
      </p>
      <FigureTable
        className="mt-3"
        columns={[
          { label: "Period" },
          { label: "Months", align: "right" },
          { label: "Energy (kWh)", align: "right" },
          {
            label: degreeDayLabel(analysis.driver, analysis.baseC),
            align: "right",
          },
          { label: "kWh per degree day", align: "right" },
          { label: "kWh per m²", align: "right" },
        ]}
      >
        {rows.map(([label, period, e]) => (
          <tr key={label} className="border-t border-line tabular-nums">
            <th scope="row" className="px-2 py-1 text-left font-semibold">
              {label}{" "}
              <span className="font-normal text-ink-muted">
                {monthShort(period.from)}–{monthShort(period.to)}
              </span>
            </th>
            <td className="px-2 py-1 text-right">{e.months}</td>
            <td className="px-2 py-1 text-right">
              {formatNumber(e.kwh, DECIMALS.kWh)}
            </td>
            <td className="px-2 py-1 text-right">
              {formatNumber(e.degreeDays, DECIMALS.degreeDays, { fixed: true })}
            </td>
            <td className="px-2 py-1 text-right">
              {formatNumber(e.kwhPerDegreeDay, 1, { fixed: true })}
            </td>
            <td className="px-2 py-1 text-right">
              {formatNumber(e.kwhPerM2, 2, { fixed: true })}
            </td>
          </tr>
        ))}
      </FigureTable>
      <p className="mt-2 text-sm text-ink-muted">
        {view.site.floorAreaM2 === null
          ? "The site has no floor area, so there is no figure per m²."
          : `Floor area ${formatArea(view.site.floorAreaM2)}.`}
      </p>
    </SectionCard>
  );
}
