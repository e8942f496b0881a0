/**
 * The byte-level checks of a PDF signature on hand-made files. A signature
 * dictionary's /ByteRange [a b c d] names the signed bytes [a, a+b) and
 * [c, c+d); the gap must be exactly the /Contents hex string (ISO 32000-1
 * §12.8.1).
 */
import { describe, expect, it } from "vitest";
import {
  checkCoverage,
  findByteRange,
  hasEofMarker,
  hasPdfHeader,
  signedParts,
  type ByteRange,
} from "../../app/reports/signing/byte-range";

const HEAD = "%PDF-1.7\n1 0 obj << /ByteRange [0 B C D] /Contents ";
const HEX = "<3082aa00>";
const TAIL = " >>\nendobj\n%%EOF";

/** A file whose ranges are right: everything but the hex string is signed. */
function file(hex = HEX): { bytes: Buffer; range: ByteRange } {
  // Fixed-width numbers, as signers write them, so the head's length is
  // known before the numbers are.
  const pad = (n: number) => String(n).padStart(10, "0");
  const b = HEAD.replace("B C D", `${pad(0)} ${pad(0)} ${pad(0)}`).length;
  const c = b + hex.length;
  const head = HEAD.replace("B C D", `${pad(b)} ${pad(c)} ${pad(TAIL.length)}`);
  return {
    bytes: Buffer.from(head + hex + TAIL, "latin1"),
    range: [0, b, c, TAIL.length],
  };
}

describe("finding the signature", () => {
  it("reads the four numbers after /ByteRange", () => {
    const { bytes, range } = file();
    expect(findByteRange(bytes)).toEqual({ ok: true, value: range });
  });

  it("says there is none when /ByteRange is absent", () => {
    expect(findByteRange(Buffer.from("%PDF-1.7\n%%EOF"))).toBeNull();
  });

  it("calls a /ByteRange without four numbers malformed", () => {
    expect(
      findByteRange(Buffer.from("%PDF-1.7 /ByteRange [0 ** ** **] %%EOF")),
    ).toMatchObject({
      ok: false,
      reason: "malformed_signature",
    });
  });

  it("knows a PDF's first and last marks", () => {
    expect(hasPdfHeader(Buffer.from("%PDF-1.7\n"))).toBe(true);
    expect(hasPdfHeader(Buffer.from(" %PDF-1.7\n"))).toBe(false);
    expect(hasEofMarker(Buffer.from("…%%EOF\r\n"))).toBe(true);
    expect(hasEofMarker(Buffer.from("…%%EOF\n%junk"))).toBe(false);
  });
});

describe("coverage", () => {
  it("accepts ranges that leave out only the hex string", () => {
    const { bytes, range } = file();
    const result = checkCoverage(bytes, range);
    expect(result).toEqual({
      ok: true,
      value: { hexStart: range[1] + 1, hexEnd: range[2] - 1 },
    });
    expect(
      Buffer.concat(signedParts(bytes, range)).toString("latin1"),
    ).not.toContain(HEX);
  });

  it("reports bytes added after the signed part, and how many", () => {
    const { bytes, range } = file();
    const longer = Buffer.concat([bytes, Buffer.from("\n%%EOF\n")]);
    expect(checkCoverage(longer, range)).toMatchObject({
      ok: false,
      reason: "not_whole_document",
      message: expect.stringMatching(/^7 bytes were added/),
    });
  });

  it("reports a file shorter than its ranges as truncated", () => {
    const { bytes, range } = file();
    expect(
      checkCoverage(bytes.subarray(0, bytes.length - 1), range),
    ).toMatchObject({
      ok: false,
      reason: "truncated",
    });
  });

  it("reports an unsigned beginning", () => {
    const { bytes, range } = file();
    const [, b, c, d] = range;
    expect(checkCoverage(bytes, [1, b - 1, c, d])).toMatchObject({
      ok: false,
      reason: "not_whole_document",
      message: "The first 1 bytes of the file are outside the signed ranges.",
    });
  });

  it("reports a gap that holds more than the hex string", () => {
    const { bytes, range } = file();
    const [, b, c, d] = range;
    // Widen the gap by one signed byte on the left: it now starts with a space.
    expect(checkCoverage(bytes, [0, b - 1, c, d])).toMatchObject({
      ok: false,
      reason: "not_whole_document",
      message: expect.stringMatching(/not just the signature value/),
    });
  });

  it("reports non-hex characters inside the gap", () => {
    const { bytes, range } = file("<30zz>");
    expect(checkCoverage(bytes, range)).toMatchObject({
      ok: false,
      reason: "not_whole_document",
    });
  });

  it("reports overlapping ranges as malformed", () => {
    const { bytes, range } = file();
    const [, b, , d] = range;
    expect(checkCoverage(bytes, [0, b, b, d])).toMatchObject({
      ok: false,
      reason: "malformed_signature",
    });
  });
});
