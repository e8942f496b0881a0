/**
 * The energy balance of a site over the period as a flow diagram: what
 * enters the boundary on the left, the site in the middle, what leaves it
 * and what stays (the net, used or lost within the boundary) on the right.
 * Both sides carry the same total, so the bands conserve energy.
 */
import { ensureSpace, frame } from "../layout";
import { drawText, wrapLines } from "../text";
import { colours } from "../theme";

export interface Flow {
  label: string;
  /** Magnitude, kWh: the band's width. */
  kwh: number;
  /** The signed figure shown beside it. */
  detail: string;
  color: string;
}

export interface BalanceChartSpec {
  siteName: string;
  netDetail: string;
  inflows: Flow[];
  outflows: Flow[];
}

const LABEL_WIDTH = 128;
const BAR = 9;
const MIN_HEIGHT = 96;
const LABEL_STEP = 21;

interface Segment extends Flow {
  y: number;
  h: number;
}

function stack(flows: readonly Flow[], top: number, perKwh: number): Segment[] {
  const gap = flows.length > 1 ? 2 : 0;
  let y = top;
  return flows.map((f) => {
    const h = Math.max(1.2, f.kwh * perKwh);
    const segment = { ...f, y, h };
    y += h + gap;
    return segment;
  });
}

/** Label centres near their segments, at least LABEL_STEP apart. */
function labelCentres(
  segments: readonly Segment[],
  top: number,
  bottom: number,
) {
  const ys = segments.map((s) => s.y + s.h / 2);
  for (let i = 1; i < ys.length; i += 1)
    ys[i] = Math.max(ys[i], ys[i - 1] + LABEL_STEP);
  const overflow = ys.length ? ys[ys.length - 1] + LABEL_STEP / 2 - bottom : 0;
  if (overflow > 0) for (let i = 0; i < ys.length; i += 1) ys[i] -= overflow;
  for (let i = 0; i < ys.length; i += 1)
    ys[i] = Math.max(ys[i], top + LABEL_STEP / 2 + i * LABEL_STEP);
  return ys;
}

function band(
  doc: PDFKit.PDFDocument,
  x1: number,
  a: [number, number],
  x2: number,
  b: [number, number],
  color: string,
) {
  const mid = (x1 + x2) / 2;
  doc
    .moveTo(x1, a[0])
    .bezierCurveTo(mid, a[0], mid, b[0], x2, b[0])
    .lineTo(x2, b[1])
    .bezierCurveTo(mid, b[1], mid, a[1], x1, a[1])
    .closePath()
    .fillOpacity(0.28)
    .fill(color)
    .fillOpacity(1);
}

function drawLabels(
  doc: PDFKit.PDFDocument,
  segments: readonly Segment[],
  centres: readonly number[],
  x: number,
  align: "left" | "right",
  anchorX: number,
) {
  segments.forEach((s, i) => {
    const y = centres[i];
    if (Math.abs(y - (s.y + s.h / 2)) > 2)
      doc
        .moveTo(anchorX, s.y + s.h / 2)
        .lineTo(align === "right" ? x + LABEL_WIDTH + 1 : x - 1, y)
        .lineWidth(0.4)
        .strokeColor(colours.lineStrong)
        .stroke();
    drawText(doc, s.label, x, y - 9, {
      size: 7.8,
      weight: "semibold",
      color: colours.ink,
      width: LABEL_WIDTH,
      align,
    });
    drawText(doc, s.detail, x, y + 0.5, {
      size: 7.6,
      color: colours.inkMuted,
      width: LABEL_WIDTH,
      align,
    });
  });
}

function plotHeight(spec: BalanceChartSpec): number {
  const rows = Math.max(spec.inflows.length, spec.outflows.length);
  return Math.max(MIN_HEIGHT, rows * LABEL_STEP + 16);
}

/** The room the diagram takes below the cursor. */
export function balanceChartHeight(spec: BalanceChartSpec): number {
  return plotHeight(spec) + 16;
}

export function drawBalanceChart(
  doc: PDFKit.PDFDocument,
  spec: BalanceChartSpec,
): void {
  const height = plotHeight(spec);
  ensureSpace(doc, balanceChartHeight(spec));
  const top = doc.y + 6;
  const inTotal = spec.inflows.reduce((s, f) => s + f.kwh, 0);
  const outTotal = spec.outflows.reduce((s, f) => s + f.kwh, 0);
  const total = Math.max(inTotal, outTotal);
  const gaps = Math.max(spec.inflows.length, spec.outflows.length) * 2;
  const perKwh = total > 0 ? (height - 8 - gaps) / total : 0;

  const leftBar = frame.left + LABEL_WIDTH + 8;
  const rightBar = frame.right - LABEL_WIDTH - 8 - BAR;
  const siteWidth = 118;
  const siteX = (leftBar + BAR + rightBar) / 2 - siteWidth / 2;
  const inSegs = stack(spec.inflows, top + 4, perKwh);
  const outSegs = stack(spec.outflows, top + 4, perKwh);

  // Bands into and out of the site box, stacked along its edges.
  let edge = top + 4;
  for (const s of inSegs) {
    band(
      doc,
      leftBar + BAR,
      [s.y, s.y + s.h],
      siteX,
      [edge, edge + s.h],
      s.color,
    );
    edge += s.h;
  }
  edge = top + 4;
  for (const s of outSegs) {
    band(
      doc,
      siteX + siteWidth,
      [edge, edge + s.h],
      rightBar,
      [s.y, s.y + s.h],
      s.color,
    );
    edge += s.h;
  }
  for (const s of [
    ...inSegs.map((x) => ({ ...x, x: leftBar })),
    ...outSegs.map((x) => ({ ...x, x: rightBar })),
  ])
    doc.rect(s.x, s.y, BAR, s.h).fill(s.color);

  doc.roundedRect(siteX, top, siteWidth, height, 5).fill(colours.spruce700);
  const name = wrapLines(doc, spec.siteName, siteWidth - 12, {
    size: 9,
    weight: "semibold",
  }).slice(0, 2);
  name.forEach((line, i) =>
    drawText(
      doc,
      line,
      siteX + 6,
      top + height / 2 - 6 - 11 * (name.length - i),
      {
        size: 9,
        weight: "semibold",
        color: colours.surface,
        width: siteWidth - 12,
        align: "center",
      },
    ),
  );
  drawText(doc, "Net into the site", siteX + 6, top + height / 2 - 2, {
    size: 7.4,
    color: colours.spruce100,
    width: siteWidth - 12,
    align: "center",
  });
  drawText(doc, spec.netDetail, siteX + 6, top + height / 2 + 8, {
    size: 8.4,
    weight: "semibold",
    color: colours.surface,
    width: siteWidth - 12,
    align: "center",
  });

  drawLabels(
    doc,
    inSegs,
    labelCentres(inSegs, top, top + height),
    frame.left,
    "right",
    leftBar,
  );
  drawLabels(
    doc,
    outSegs,
    labelCentres(outSegs, top, top + height),
    rightBar + BAR + 8,
    "left",
    rightBar + BAR,
  );
  doc.y = top + height + 10;
  doc.x = frame.left;
}
