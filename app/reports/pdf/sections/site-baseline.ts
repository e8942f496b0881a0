/**
 * A site's energy against its saved baselines: per carrier a chart of the
 * metered energy (bars) and what the baseline expects for each month's
 * degree days (line), the model and its Guideline 14 statistics, the
 * months in a table and the avoided energy use over the period.
 */
import { degreeDayLabel } from "~/baselines/degree-days";
import type {
  Assessment,
  BaselineComparison,
  SiteReport,
} from "../../data/types";
import { formatCelsius, monthShort } from "~/lib/format";
import { chartHeight, drawMonthlyChart } from "../charts/monthly-chart";
import { magnitude, signedNumber, signedPercent } from "../format";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Row } from "../table";
import { carrierColours, colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";
import { monthlyByCarrierOfSite } from "./site-charts";

function verdict(
  a: Assessment,
  label: string,
): { text: string; color: string; weight: "semibold" } {
  return a.pass
    ? { text: `Meets: ${label}`, color: colours.spruce700, weight: "semibold" }
    : {
        text: `Does not meet: ${label}`,
        color: colours.danger600,
        weight: "semibold",
      };
}

function statistic(value: number | null, digits = 2) {
  return value === null ? "—" : `${value.toFixed(digits)} %`;
}

function drawModel(doc: PDFKit.PDFDocument, b: BaselineComparison) {
  const months = `${monthShort(b.from)} to ${monthShort(b.to)}`;
  body(doc, [
    { text: "Model: ", weight: "semibold" },
    {
      text: `E = ${magnitude(b.intercept)} kWh + ${b.slope.toFixed(2)} kWh per degree day × ${degreeDayLabel(b.driver, b.baseC)}, ordinary least squares on ${b.n} ${b.granularity} periods (${months}), degree days to a base of ${formatCelsius(b.baseC)}.`,
    },
    ...(b.baseC !== b.siteBaseC
      ? [
          {
            text: ` The site's degree day base is now ${formatCelsius(b.siteBaseC)}; the model keeps the base it was fitted with.`,
            color: colours.caution700,
          },
        ]
      : []),
    {
      text: ` Saved ${b.createdAt.slice(0, 10)}${b.createdBy ? ` by ${b.createdBy}` : ""}.`,
    },
  ]);
  if (b.shortFitWarning) {
    body(doc, [
      { text: "Caution: ", weight: "semibold", color: colours.caution700 },
      { text: b.shortFitWarning, color: colours.caution700 },
    ]);
  }
  const limits = b.assessment;
  drawTable(doc, {
    columns: [
      { header: "n", width: 40, align: "right" },
      { header: "R²", width: 55, align: "right" },
      { header: "CV(RMSE)", width: 70, align: "right" },
      { header: "NMBE", width: 70, align: "right" },
      { header: "Guideline 14, CV(RMSE)", width: 130 },
      { header: "Guideline 14, NMBE", width: 130 },
    ],
    rows: [
      {
        cells: [
          String(b.n),
          b.r2 === null ? "—" : b.r2.toFixed(3),
          statistic(b.cvrmse),
          statistic(b.nmbe),
          verdict(limits.cvrmse, `at most ${limits.cvrmse.limit} %`),
          verdict(limits.nmbe, `at most ±${limits.nmbe.limit} %`),
        ],
      },
    ],
    keepRows: 1,
  });
}

function drawMonths(doc: PDFKit.PDFDocument, b: BaselineComparison) {
  const w = widths(1, 0.8, 0.8, 1.3, 1.3, 1, 1.6);
  const rows: Row[] = b.months.map((m) => ({
    cells: [
      monthShort(m.month),
      m.hdd === null ? "—" : m.hdd.toFixed(1),
      m.cdd === null ? "—" : m.cdd.toFixed(1),
      m.expectedKwh === null ? "—" : magnitude(m.expectedKwh),
      m.actualKwh === null ? "—" : magnitude(m.actualKwh),
      m.difference === null ? "—" : signedPercent(100 * m.difference),
      {
        text: [m.note, m.extrapolated ? "outside the fitted range" : null]
          .filter(Boolean)
          .join("; "),
        color: colours.inkMuted,
      },
    ],
  }));
  rows.push({
    kind: "total",
    cells: [
      `${b.comparedMonths} compared`,
      "",
      "",
      magnitude(b.expectedKwh),
      magnitude(b.actualKwh),
      b.avoidedPercent === null ? "—" : signedPercent(-b.avoidedPercent),
      "",
    ],
  });
  drawTable(doc, {
    columns: [
      { header: "Month", width: w[0] },
      { header: degreeDayLabel("hdd", b.baseC), width: w[1], align: "right" },
      { header: degreeDayLabel("cdd", b.baseC), width: w[2], align: "right" },
      { header: "Expected (kWh)", width: w[3], align: "right" },
      { header: "Metered (kWh)", width: w[4], align: "right" },
      { header: "Difference", width: w[5], align: "right" },
      { header: "Note", width: w[6] },
    ],
    rows,
    caption: `Baseline, ${carrierLabels[b.carrier].toLowerCase()}`,
  });
}

function drawComparison(doc: PDFKit.PDFDocument, b: BaselineComparison) {
  heading(
    doc,
    `${carrierLabels[b.carrier]}: against the baseline of ${monthShort(b.from)} to ${monthShort(b.to)}`,
    3,
    chartHeight(130),
  );
  // One month is a single bar: the table below says it better.
  if (b.months.length > 1)
    drawMonthlyChart(doc, {
      months: b.months.map((m) => m.month),
      bars: [
        {
          label: `Metered ${carrierLabels[b.carrier].toLowerCase()} delivered`,
          color: carrierColours[b.carrier],
          values: b.months.map((m) => m.actualKwh),
        },
      ],
      line: {
        label: "Expected by the baseline",
        color: colours.spruce700,
        values: b.months.map((m) => m.expectedKwh),
        hollow: b.months.map((m) => m.extrapolated),
        hollowLabel: "Degree days outside the fitted range",
      },
      height: 130,
      axisTitle: "Energy delivered",
    });
  drawModel(doc, b);
  space(doc, 8);
  drawMonths(doc, b);
  space(doc, 4);
  body(doc, [
    { text: "Avoided energy use ", weight: "semibold" },
    {
      text: "(IPMVP: the baseline at the months' degree days, less the metered energy) over ",
    },
    { text: `${b.comparedMonths} month${b.comparedMonths === 1 ? "" : "s"}: ` },
    { text: `${signedNumber(b.avoidedKwh)} kWh`, weight: "semibold" },
    {
      text:
        b.avoidedPercent === null
          ? "."
          : ` (${signedPercent(b.avoidedPercent)} of the expected energy). Positive means less energy was used than the weather explains.`,
    },
  ]);
}

export function drawSiteBaselines(
  doc: PDFKit.PDFDocument,
  site: SiteReport,
  months: readonly string[],
): void {
  heading(doc, "Energy against baseline", 2, chartHeight(120) + 40);
  if (site.baselines.length === 0) {
    const chart = site.tables.length > 0 && months.length > 1;
    body(
      doc,
      `No baseline is saved for this site, so there is nothing to compare with. A baseline is fitted and saved on the Weather & baselines page.${chart ? " The chart shows the site's energy delivered and exported per month, by carrier." : ""}`,
      { color: colours.inkMuted },
    );
    if (chart)
      drawMonthlyChart(doc, {
        months: [...months],
        bars: monthlyByCarrierOfSite(site, months),
        height: 120,
        axisTitle: "Delivered (+) and exported (−)",
      });
    return;
  }
  site.baselines.forEach((b, i) => {
    if (i > 0) space(doc, 10);
    drawComparison(doc, b);
  });
}
