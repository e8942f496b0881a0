/**
 * Source Sans 3 from the app's own package (@fontsource/source-sans-3),
 * embedded in every report. The `.woff` files are used (pdfkit's `.woff2`
 * embedding renders blank), unwrapped to plain OpenType once per process. Each file holds one
 * Unicode subset, so text is split into runs by the subset that covers each
 * character (the ranges come from the package's unicode.json): Latin for
 * most, Greek for ρ, Δ, φ, Σ, Latin Extended for names such as Łódź.
 * Characters in no subset (≤, √, →) are avoided in the report's own text.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { inflateSync } from "node:zlib";
import { sharedFont } from "./shared-fonts.server";

export const weights = ["regular", "italic", "semibold", "bold"] as const;
export type Weight = (typeof weights)[number];

const subsets = ["latin", "latin-ext", "greek"] as const;
type Subset = (typeof subsets)[number];

const FILE_SUFFIX: Record<Weight, string> = {
  regular: "400-normal",
  italic: "400-italic",
  semibold: "600-normal",
  bold: "700-normal",
};

const PACKAGE = "@fontsource/source-sans-3";

let packageDir: string | undefined;

function fontPackageDir(): string {
  packageDir ??= dirname(
    createRequire(import.meta.url).resolve(`${PACKAGE}/package.json`),
  );
  return packageDir;
}

export function fontFile(subset: Subset, weight: Weight): string {
  return join(
    fontPackageDir(),
    "files",
    `source-sans-3-${subset}-${FILE_SUFFIX[weight]}.woff`,
  );
}

/** The registered name of a face: "latin-semibold", "greek-regular", … */
export const faceName = (subset: Subset, weight: Weight) =>
  `${subset}-${weight}`;

/**
 * The plain OpenType font inside a WOFF file (WOFF 1.0, W3C: each table
 * zlib-compressed unless that saved nothing). fontkit reads a WOFF by
 * inflating a table again on every access, which makes laying out a long
 * report take seconds; unwrapped once, the same font lays out at once.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString("latin1", 0, 4) !== "wOFF")
    throw new Error("Not a WOFF 1.0 font.");
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const stored = woff.subarray(offset, offset + compLength);
    return {
      tag: woff.subarray(at, at + 4),
      checksum: woff.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(stored) : stored,
    };
  });
  const power = 2 ** Math.floor(Math.log2(numTables));
  const header = Buffer.alloc(12 + 16 * numTables);
  woff.copy(header, 0, 4, 8); // the flavour: the sfnt version
  header.writeUInt16BE(numTables, 4);
  header.writeUInt16BE(power * 16, 6);
  header.writeUInt16BE(Math.log2(power), 8);
  header.writeUInt16BE(numTables * 16 - power * 16, 10);
  const parts: Buffer[] = [header];
  let offset = header.length;
  tables.forEach((table, i) => {
    const record = 12 + i * 16;
    table.tag.copy(header, record);
    header.writeUInt32BE(table.checksum, record + 4);
    header.writeUInt32BE(offset, record + 8);
    header.writeUInt32BE(table.data.length, record + 12);
    const padded = Buffer.alloc(Math.ceil(table.data.length / 4) * 4);
    table.data.copy(padded);
    parts.push(padded);
    offset += padded.length;
  });
  return Buffer.concat(parts);
}

// Unwrapped once per process: every report embeds the same fonts.
const fonts = new Map<string, Buffer>();

function fontBytes(subset: Subset, weight: Weight): Buffer {
  const path = fontFile(subset, weight);
  let bytes = fonts.get(path);
  if (!bytes) {
    bytes = woffToSfnt(readFileSync(path));
    fonts.set(path, bytes);
  }
  return bytes;
}

export function registerFonts(doc: PDFKit.PDFDocument): void {
  for (const subset of subsets)
    for (const weight of weights)
      doc.registerFont(
        faceName(subset, weight),
        // pdfkit takes a parsed font as it takes bytes; its typings omit it.
        sharedFont(fontFile(subset, weight), () =>
          fontBytes(subset, weight),
        ) as unknown as Buffer,
      );
}

type Ranges = [number, number][];

let coverage: Record<Subset, Ranges> | undefined;

function parseRanges(spec: string): Ranges {
  return spec.split(",").map((part) => {
    const [lo, hi] = part.trim().replace(/^U\+/i, "").split("-");
    return [parseInt(lo, 16), parseInt(hi ?? lo, 16)];
  });
}

function subsetCoverage(): Record<Subset, Ranges> {
  if (!coverage) {
    const json = JSON.parse(
      readFileSync(join(fontPackageDir(), "unicode.json"), "utf8"),
    ) as Record<string, string>;
    coverage = {
      latin: parseRanges(json.latin),
      "latin-ext": parseRanges(json["latin-ext"]),
      greek: parseRanges(json.greek),
    };
  }
  return coverage;
}

const inRanges = (ranges: Ranges, cp: number) =>
  ranges.some(([lo, hi]) => cp >= lo && cp <= hi);

const subsetCache = new Map<string, Subset | null>();

/** The subset that has a glyph for the character, or null if none does. */
export function subsetOf(char: string): Subset | null {
  let subset = subsetCache.get(char);
  if (subset === undefined) {
    const cp = char.codePointAt(0) ?? 0;
    const ranges = subsetCoverage();
    subset = subsets.find((s) => inRanges(ranges[s], cp)) ?? null;
    subsetCache.set(char, subset);
  }
  return subset;
}

export interface Run {
  face: string;
  text: string;
}

/**
 * Splits text into runs of one face each. Spaces belong to the Latin face
 * (the other subsets carry no space); a character no subset covers is drawn
 * with the Latin face too (it shows as an empty box), so nothing is lost
 * from the text layer.
 */
export function runs(text: string, weight: Weight): Run[] {
  const out: Run[] = [];
  for (const char of text) {
    const face = faceName(subsetOf(char) ?? "latin", weight);
    const last = out.at(-1);
    if (last && last.face === face) last.text += char;
    else out.push({ face, text: char });
  }
  return out;
}
