/**
 * The byte-level checks of a PDF signature (ISO 32000-1 §12.8.1): the
 * signature dictionary's /ByteRange [a b c d] names the signed bytes
 * [a, a+b) and [c, c+d); the gap between them must be exactly the /Contents
 * hex string `<…>` that holds the signature, and nothing else may be unsigned.
 * Pure functions over bytes: no PDF object parsing, no cryptography.
 */

export type ByteRange = [number, number, number, number];

export type ByteRangeProblem =
  | "not_a_pdf"
  | "no_signature"
  | "malformed_signature"
  | "truncated"
  | "not_whole_document";

export type Checked<T> =
  | { ok: true; value: T }
  | { ok: false; reason: ByteRangeProblem; message: string };

const BYTE_RANGE =
  /\/ByteRange\s*\[\s*(\d{1,12})\s+(\d{1,12})\s+(\d{1,12})\s+(\d{1,12})\s*\]/;
/** Readers look for %%EOF near the end; trailing whitespace is allowed. */
const EOF_MARKER = /%%EOF[\r\n\t\f\0 ]*$/;
const EOF_WINDOW = 1024;

export function hasPdfHeader(bytes: Buffer): boolean {
  return bytes.subarray(0, 5).toString("latin1") === "%PDF-";
}

export function hasEofMarker(bytes: Buffer): boolean {
  const tail = bytes.subarray(Math.max(0, bytes.length - EOF_WINDOW));
  return EOF_MARKER.test(tail.toString("latin1"));
}

/**
 * The first signature's /ByteRange: Joulebook reports carry one signature,
 * and anything added after it is reported by the coverage check.
 */
export function findByteRange(bytes: Buffer): Checked<ByteRange> | null {
  const at = bytes.indexOf("/ByteRange", 0, "latin1");
  if (at < 0) return null;
  const match = BYTE_RANGE.exec(bytes.toString("latin1", at, at + 120));
  if (!match)
    return {
      ok: false,
      reason: "malformed_signature",
      message:
        "The signature's /ByteRange is not four whole numbers, so the signed part of the file cannot be read.",
    };
  const range = match.slice(1, 5).map(Number) as ByteRange;
  return { ok: true, value: range };
}

/**
 * Checks that the ranges cover the whole file except the /Contents hex string,
 * and returns that string's position (without the angle brackets).
 */
export function checkCoverage(
  bytes: Buffer,
  [a, b, c, d]: ByteRange,
): Checked<{ hexStart: number; hexEnd: number }> {
  const signedEnd = c + d;
  if (a + b > bytes.length || signedEnd > bytes.length)
    return fail(
      "truncated",
      `The signature covers ${Math.max(a + b, signedEnd)} bytes but the file has only ${bytes.length}: it was cut short.`,
    );
  if (a !== 0)
    return fail(
      "not_whole_document",
      `The first ${a} bytes of the file are outside the signed ranges.`,
    );
  if (b < 2 || c < b + 2)
    return fail(
      "malformed_signature",
      `The signed ranges [0, ${b}) and [${c}, ${signedEnd}) overlap or leave no room for the signature value.`,
    );
  const gapIsHexString =
    bytes[b] === 0x3c /* < */ &&
    bytes[c - 1] === 0x3e /* > */ &&
    isHex(bytes, b + 1, c - 1);
  if (!gapIsHexString)
    return fail(
      "not_whole_document",
      `Bytes ${b}–${c - 1} are unsigned and are not just the signature value <…>: something else sits in the gap between the signed ranges.`,
    );
  if (signedEnd < bytes.length)
    return fail(
      "not_whole_document",
      `${bytes.length - signedEnd} bytes were added after the signed part of the file (the signature covers bytes 0–${signedEnd - 1} of ${bytes.length}).`,
    );
  return { ok: true, value: { hexStart: b + 1, hexEnd: c - 1 } };
}

function isHex(bytes: Buffer, start: number, end: number): boolean {
  if ((end - start) % 2 !== 0) return false;
  for (let i = start; i < end; i++) {
    const x = bytes[i];
    const digit = x >= 0x30 && x <= 0x39;
    const lower = x >= 0x61 && x <= 0x66;
    const upper = x >= 0x41 && x <= 0x46;
    if (!digit && !lower && !upper) return false;
  }
  return true;
}

function fail(
  reason: ByteRangeProblem,
  message: string,
): { ok: false; reason: ByteRangeProblem; message: string } {
  return { ok: false, reason, message };
}

/** The signed bytes, in order: what the messageDigest attribute is taken of. */
export function signedParts(bytes: Buffer, [a, b, c, d]: ByteRange): Buffer[] {
  return [bytes.subarray(a, a + b), bytes.subarray(c, c + d)];
}
