import { degreeDayLabel } from "~/baselines/degree-days";
import type { AnalysisView } from "~/baselines/weather-page.server";
import { FigureTable } from "~/components/figure-table";
import { SectionCard } from "~/components/section-card";
import { cx, Notice } from "~/components/ui";
import { Stat } from "~/components/weather/stat";
import {
  DECIMALS,
  formatKwh,
  formatNumber,
  formatPercentPoints,
  monthShort,
} from "~/lib/format";

/** Avoided energy use of the reporting period against the baseline model, in its weather. */
export function SavingsCard({ analysis }: { analysis: AnalysisView }) {
  const { savings } = analysis;
  const skipped = analysis.months.filter(
    (m) =>
      !m.usable &&
      m.month >= analysis.reporting.from &&
      m.month <= analysis.reporting.to,
  );
  return (
    <SectionCard headingId="savings-heading" title="Weather-normalised savings">
      <p className="mt-1 text-ink-muted">
        Avoided energy use = adjusted baseline − reporting-period energy: the
        baseline model restated to each reporting month's degree days, less what
        was metered. Positive means less energy was used than the baseline
        predicts for that weather.
      </p>
      {savings ? (
        <>
          <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4">
            <Stat label="Adjusted baseline">
              {formatKwh(savings.adjustedBaselineKwh)}
            </Stat>
            <Stat label="Metered">{formatKwh(savings.reportingKwh)}</Stat>
            <Stat label="Avoided energy use">
              {formatKwh(savings.avoidedKwh, { plus: true })}
            </Stat>
            <Stat label="Of the adjusted baseline">
              {formatPercentPoints(savings.avoidedPercent, { plus: true })}
            </Stat>
          </dl>
          {analysis.extrapolated.length > 0 ? (
            <div className="mt-3">
              <Notice tone="caution">
                {analysis.extrapolated.map(monthShort).join(", ")}{" "}
                {analysis.extrapolated.length === 1 ? "has" : "have"} degree
                days outside the baseline months' range: the model is
                extrapolated there.
              </Notice>
            </div>
          ) : null}
          <FigureTable
            className="mt-3"
            maxHeight="max-h-96"
            columns={[
              { label: "Month" },
              {
                label: degreeDayLabel(analysis.driver, analysis.baseC),
                align: "right",
              },
              { label: "Adjusted baseline (kWh)", align: "right" },
              { label: "Metered (kWh)", align: "right" },
              { label: "Avoided (kWh)", align: "right" },
            ]}
          >
            {savings.months.map((m) => (
              <tr key={m.month} className="border-t border-line tabular-nums">
                <td className="px-2 py-1">{monthShort(m.month)}</td>
                <td className="px-2 py-1 text-right">
                  {formatNumber(m.dd, DECIMALS.degreeDays, { fixed: true })}
                </td>
                <td className="px-2 py-1 text-right">
                  {formatNumber(m.adjustedKwh, DECIMALS.kWh)}
                </td>
                <td className="px-2 py-1 text-right">
                  {formatNumber(m.actualKwh, DECIMALS.kWh)}
                </td>
                <td
                  className={cx(
                    "px-2 py-1 text-right font-semibold",
                    m.avoidedKwh < 0 && "text-danger-700",
                  )}
                >
                  {formatNumber(m.avoidedKwh, DECIMALS.kWh, { plus: true })}
                </td>
              </tr>
            ))}
          </FigureTable>
        </>
      ) : (
        <p className="mt-3">
          {analysis.model
            ? "No reporting month has both complete weather and a ledger entry."
            : "Savings need a baseline model first."}
        </p>
      )}
      {skipped.length > 0 ? (
        <p className="mt-2 text-sm text-ink-muted">
          Left out of the reporting period:{" "}
          {skipped.map((m) => `${monthShort(m.month)} (${m.note})`).join(", ")}.
        </p>
      ) : null}
    </SectionCard>
  );
}
