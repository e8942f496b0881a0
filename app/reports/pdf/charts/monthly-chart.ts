/**
 * Monthly energy as bars, signed (delivered above the zero line, exported
 * below), with an optional line: the energy a baseline expects. Series of
 * one group stack in one bar; groups (carriers) stand side by side, so
 * unlike carriers are never stacked into one height. Vector graphics only.
 */
import { monthShort } from "~/lib/format";
import { ensureSpace, frame } from "../layout";
import { drawText } from "../text";
import { colours, type } from "../theme";
import { drawLegend, type LegendItem } from "./legend";
import { axisFor, energyScale, tickLabel } from "./scale";

export interface BarSeries {
  label: string;
  color: string;
  /** kWh per month, signed; null where there is no figure. */
  values: (number | null)[];
  /** Series of one group stack in one bar; groups stand side by side. One group by default. */
  group?: string;
  /** Fill opacity, 1 by default (a lighter shade for exports). */
  opacity?: number;
}

export interface LineSeries {
  label: string;
  color: string;
  values: (number | null)[];
  /** Months whose point lies outside the range the model was fitted on. */
  hollow?: boolean[];
  hollowLabel?: string;
}

export interface MonthlyChartSpec {
  /** YYYY-MM, one per slot. */
  months: string[];
  bars: BarSeries[];
  line?: LineSeries;
  /** Height of the plot area, points. */
  height?: number;
  /** What the values are, shown with the unit on the axis. */
  axisTitle: string;
}

const AXIS_WIDTH = 46;

/** Everything the chart takes: axis title, plot, month labels and legend. */
export function chartHeight(plotHeight: number): number {
  return plotHeight + 56;
}

function monthTicks(months: readonly string[]): string[] {
  return months.map((m) =>
    months.length > 6 ? monthShort(m).slice(0, 3) : monthShort(m),
  );
}

function groupsOf(spec: MonthlyChartSpec): BarSeries[][] {
  const groups = new Map<string, BarSeries[]>();
  for (const s of spec.bars)
    groups.set(s.group ?? "", [...(groups.get(s.group ?? "") ?? []), s]);
  return [...groups.values()];
}

/** Stacked extremes per month and group: a bar reaches from the sum of its negatives to the sum of its positives. */
function stackedExtremes(spec: MonthlyChartSpec): number[] {
  const groups = groupsOf(spec);
  return spec.months.flatMap((_, i) => {
    const ends = groups.flatMap((group) => {
      let up = 0;
      let down = 0;
      for (const s of group) {
        const v = s.values[i] ?? 0;
        if (v > 0) up += v;
        else down += v;
      }
      return [up, down];
    });
    const line = spec.line?.values[i];
    return line === null || line === undefined ? ends : [...ends, line];
  });
}

export function drawMonthlyChart(
  doc: PDFKit.PDFDocument,
  spec: MonthlyChartSpec,
): void {
  const plotHeight = spec.height ?? 150;
  ensureSpace(doc, chartHeight(plotHeight));
  const extremes = stackedExtremes(spec);
  const scale = energyScale(Math.max(0, ...extremes.map(Math.abs)));
  const axis = axisFor(extremes.map((v) => v / scale.divisor));
  const top = doc.y + 14;
  const left = frame.left + AXIS_WIDTH;
  const width = frame.right - left;
  const yOf = (v: number) =>
    top + ((axis.max - v / scale.divisor) / (axis.max - axis.min)) * plotHeight;

  drawText(doc, `${spec.axisTitle} (${scale.unit})`, frame.left, doc.y, {
    size: type.small,
    weight: "semibold",
    color: colours.inkMuted,
  });
  for (const tick of axis.ticks) {
    const y = yOf(tick * scale.divisor);
    doc
      .moveTo(left, y)
      .lineTo(frame.right, y)
      .lineWidth(tick === 0 ? 0.9 : 0.4)
      .strokeColor(tick === 0 ? colours.inkMuted : colours.line)
      .stroke();
    drawText(doc, tickLabel(tick, axis.step), frame.left, y - 4, {
      size: 7.2,
      color: colours.inkMuted,
      width: AXIS_WIDTH - 6,
      align: "right",
    });
  }

  const slot = width / Math.max(1, spec.months.length);
  const groups = groupsOf(spec);
  const groupsWidth = Math.min(
    slot * (groups.length > 1 ? 0.8 : 0.62),
    38 * groups.length,
  );
  const barWidth = groupsWidth / Math.max(1, groups.length);
  spec.months.forEach((_, i) => {
    groups.forEach((group, g) => {
      const x = left + i * slot + (slot - groupsWidth) / 2 + g * barWidth;
      let up = 0;
      let down = 0;
      for (const series of group) {
        const v = series.values[i];
        if (!v) continue;
        const from = v > 0 ? up : down;
        const to = from + v;
        if (v > 0) up = to;
        else down = to;
        const y1 = yOf(Math.max(from, to));
        const y2 = yOf(Math.min(from, to));
        doc
          .fillOpacity(series.opacity ?? 1)
          .rect(x, y1, barWidth, Math.max(0.6, y2 - y1))
          .fill(series.color)
          .fillOpacity(1);
      }
    });
  });

  if (spec.line)
    drawLine(doc, spec.line, (i) => left + i * slot + slot / 2, yOf);

  const labels = monthTicks(spec.months);
  labels.forEach((label, i) => {
    drawText(doc, label, left + i * slot, top + plotHeight + 4, {
      size: 7.2,
      color: colours.inkMuted,
      width: slot,
      align: "center",
    });
  });

  const legend: LegendItem[] = spec.bars.map((s) => ({
    label: s.label,
    color: s.color,
    shape: "box",
    opacity: s.opacity,
  }));
  if (spec.line) {
    legend.push({
      label: spec.line.label,
      color: spec.line.color,
      shape: "line",
    });
    if (spec.line.hollow?.some(Boolean))
      legend.push({
        label: spec.line.hollowLabel ?? "Outside the fitted range",
        color: spec.line.color,
        shape: "hollow",
      });
  }
  const legendHeight = drawLegend(doc, legend, left, top + plotHeight + 18);
  doc.y = top + plotHeight + 18 + legendHeight + 6;
  doc.x = frame.left;
}

function drawLine(
  doc: PDFKit.PDFDocument,
  line: LineSeries,
  xOf: (i: number) => number,
  yOf: (kwh: number) => number,
) {
  let drawing = false;
  line.values.forEach((v, i) => {
    if (v === null) {
      drawing = false;
      return;
    }
    if (drawing) doc.lineTo(xOf(i), yOf(v));
    else doc.moveTo(xOf(i), yOf(v));
    drawing = true;
  });
  doc.lineWidth(1.6).strokeColor(line.color).stroke();
  line.values.forEach((v, i) => {
    if (v === null) return;
    if (line.hollow?.[i])
      doc
        .circle(xOf(i), yOf(v), 2.6)
        .lineWidth(1)
        .fillColor(colours.surface)
        .strokeColor(line.color)
        .fillAndStroke();
    else doc.circle(xOf(i), yOf(v), 2.4).fill(line.color);
  });
}
