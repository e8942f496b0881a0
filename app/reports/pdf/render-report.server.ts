/**
 * The report as a PDF, drawn with pdfkit vector graphics and the app's own
 * fonts. The contract, in order:
 *
 *   const doc = createReportDocument(meta);   // bytes are collected from here on
 *   await drawReport(doc, data, onProgress);   // every page, header and footer
 *   addSignaturePlaceholder(doc, info);        // (signing) before the end
 *   doc.end();
 *   const bytes = await pdfBytes(doc);         // the whole file
 *
 * createReportDocument starts collecting the document's output at once, so
 * no byte can be missed however late pdfBytes is called; pdfBytes may be
 * called before or after doc.end() and resolves when the document ends.
 */
import PDFDocument from "pdfkit";
import type { ReportData } from "../data/types";
import { registerFonts } from "./fonts.server";
import {
  currentPageIndex,
  drawPageFurniture,
  headingPages,
  newPage,
} from "./layout";
import { drawAdjustments } from "./sections/adjustments";
import { drawBudgets } from "./sections/budgets";
import { drawCarbon } from "./sections/carbon";
import { drawCautionsSection } from "./sections/cautions";
import {
  contentsCapacity,
  drawContents,
  drawCover,
  type ContentsEntry,
} from "./sections/cover";
import { drawDataQuality } from "./sections/data-quality";
import { drawPlantChecks } from "./sections/plant-checks";
import { drawMethod } from "./sections/method";
import { drawSite } from "./sections/site";
import { drawSummary } from "./sections/summary";
import { page } from "./theme";

const collectors = new WeakMap<PDFKit.PDFDocument, Promise<Buffer>>();

export function createReportDocument(meta: {
  title: string;
  subject: string;
  author: string;
}): PDFKit.PDFDocument {
  const doc = new PDFDocument({
    pdfVersion: "1.7",
    size: page.size,
    margins: page.margins,
    bufferPages: true,
    lang: "en-GB",
    displayTitle: true,
    info: {
      Title: meta.title,
      Subject: meta.subject,
      Author: meta.author,
      Creator: "Joulebook",
    },
  });
  const chunks: Buffer[] = [];
  const bytes = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  // A failure surfaces through pdfBytes; never as an unhandled rejection.
  bytes.catch(() => undefined);
  collectors.set(doc, bytes);
  // Every text goes through these faces (text.ts), so pdfkit's default
  // standard font is never used and never written into the file.
  registerFonts(doc);
  doc.font("latin-regular");
  return doc;
}

/** The complete file, once doc.end() has been called. */
export function pdfBytes(doc: PDFKit.PDFDocument): Promise<Buffer> {
  const bytes = collectors.get(doc);
  if (!bytes)
    throw new Error("pdfBytes needs a document made by createReportDocument.");
  return bytes;
}

type Progress = (fraction: number, note: string) => void | Promise<void>;

/** Lets the event loop breathe between sections and reports progress. */
async function step(
  progress: Progress | undefined,
  fraction: number,
  note: string,
) {
  await progress?.(Math.min(1, Math.max(0, fraction)), note);
  await new Promise((resolve) => setImmediate(resolve));
}

function contentsFor(
  entries: ContentsEntry[],
  capacity: number,
): ContentsEntry[] {
  if (entries.length <= capacity) return entries;
  // Too many sites to list: one line for the sites section instead.
  const firstSite = entries.find((e) => e.level === 2);
  const top = entries.filter((e) => e.level === 1);
  if (!firstSite) return top.slice(0, capacity);
  const index = top.findIndex((e) => e.page > firstSite.page);
  const sites: ContentsEntry = {
    title: "Sites",
    page: firstSite.page,
    level: 1,
  };
  top.splice(index < 0 ? top.length : index, 0, sites);
  return top.slice(0, capacity);
}

/**
 * Draws the whole report into the document: cover, summary, one section per
 * site, adjusting entries, data quality, method notes and cautions, then the
 * contents and every page's header and footer. Does not end the document.
 */
export async function drawReport(
  doc: PDFKit.PDFDocument,
  data: ReportData,
  onProgress?: Progress,
): Promise<{ pageCount: number }> {
  const contents: ContentsEntry[] = [];
  /** A section starts where its first level-1 heading was drawn. */
  const section = (title: string, level: 1 | 2, draw: () => void) => {
    const before = headingPages(doc).length;
    draw();
    const page = headingPages(doc)[before] ?? currentPageIndex(doc);
    contents.push({ title, page, level });
  };

  await step(onProgress, 0.02, "Cover");
  const area = drawCover(doc, data);
  section("Summary", 1, () => {
    newPage(doc);
    drawSummary(doc, data);
  });
  await step(onProgress, 0.1, "Summary");
  for (const [i, site] of data.sites.entries()) {
    section(site.name, 2, () => drawSite(doc, data, site));
    const done = (i + 1) / Math.max(1, data.sites.length);
    await step(onProgress, 0.1 + 0.7 * done, site.name);
  }
  section("Carbon", 1, () => drawCarbon(doc, data));
  section("Budgets and target", 1, () => drawBudgets(doc, data));
  section("Adjusting entries", 1, () => drawAdjustments(doc, data));
  await step(onProgress, 0.85, "Adjusting entries");
  section("Data quality", 1, () => {
    drawDataQuality(doc, data);
    drawPlantChecks(doc, data);
  });
  await step(onProgress, 0.9, "Data quality");
  section("Method notes", 1, () => drawMethod(doc, data));
  // The cautions follow the method notes on the same page when they fit.
  section("Cautions", 1, () => drawCautionsSection(doc, data));
  await step(onProgress, 0.95, "Method notes");

  drawContents(doc, area, contentsFor(contents, contentsCapacity(area)));
  const pageCount = drawPageFurniture(doc, data);
  await step(onProgress, 1, "Pages numbered");
  return { pageCount };
}
