/**
 * Signed PDF reports end to end, without a database: a local CA and signer
 * in a temporary folder, a small pdfkit document, our signature, and two
 * verifiers that must agree: Poppler's pdfsig (NSS-based, the reference) and
 * verifySignedPdf (what the Verify page runs).
 *
 * Sources: PDF signatures and /ByteRange, ISO 32000-1 §12.8.1; CMS signed
 * attributes, RFC 5652 §5.4 (the messageDigest attribute, and the signature
 * over the attributes re-tagged as SET OF); pdfsig, Poppler's utility.
 */
import { execFile } from "node:child_process";
import { createHash, X509Certificate } from "node:crypto";
import {
  cp,
  mkdir,
  mkdtemp,
  readFile,
  rm,
  stat,
  writeFile,
} from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import fc from "fast-check";
import PDFDocument from "pdfkit";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  ensureLocalSigningIdentity,
  loadSigningIdentity,
  signingIdentityFrom,
  type SigningIdentity,
} from "../../app/reports/signing/identity.server";
import {
  addSignaturePlaceholder,
  REPORT_PDF_VERSION,
  signPdf,
} from "../../app/reports/signing/sign-pdf.server";
import { verifySignedPdf } from "../../app/reports/signing/verify-pdf.server";

const run = promisify(execFile);
const FONT = path.resolve(
  "node_modules/@fontsource/source-sans-3/files/source-sans-3-latin-400-normal.woff",
);
const EMAIL_PROTECTION = "1.3.6.1.5.5.7.3.4";
const DOCUMENT_SIGNING = "1.3.6.1.5.5.7.3.36";

let work: string;
let oursFiles: Awaited<ReturnType<typeof ensureLocalSigningIdentity>>;
let ours: SigningIdentity;
let theirs: SigningIdentity;
let signed: Buffer;

beforeAll(async () => {
  work = await mkdtemp(path.join(tmpdir(), "joulebook-signing-"));
  oursFiles = await ensureLocalSigningIdentity(path.join(work, "ours"));
  ours = await signingIdentityFrom({ signingDir: oursFiles.dir });
  theirs = await signingIdentityFrom({ signingDir: path.join(work, "theirs") });
  signed = await signPdf(await reportPdf(2), ours);
}, 60_000);

afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

/** A document shaped like a report: embedded font, text, our placeholder. */
async function reportPdf(pages: number, sign = true): Promise<Buffer> {
  const doc = new PDFDocument({ pdfVersion: REPORT_PDF_VERSION });
  const chunks: Buffer[] = [];
  doc.on("data", (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve) =>
    doc.on("end", () => resolve(Buffer.concat(chunks))),
  );
  doc.registerFont("body", FONT);
  doc.font("body");
  for (let page = 1; page <= pages; page++) {
    if (page > 1) doc.addPage();
    doc.fontSize(16).text(`Heat delivered, page ${page}`);
    doc.fontSize(10).text("Supply 80 °C, return 55 °C, 12.4 MWh. ".repeat(40));
  }
  if (sign)
    addSignaturePlaceholder(doc, {
      reason: "Issued by Joulebook",
      name: "Joulebook test",
      location: "Joulebook",
      contactInfo: "",
    });
  doc.end();
  return done;
}

/** pdfsig exits 0 whatever it finds; its verdict is in the text. */
async function pdfsig(
  bytes: Buffer,
): Promise<{ validation: string; whole: boolean }> {
  const file = path.join(
    work,
    `check-${Math.random().toString(36).slice(2)}.pdf`,
  );
  await writeFile(file, bytes);
  const { stdout } = await run("pdfsig", [file]);
  const validation = /Signature Validation: (.*)/.exec(stdout)?.[1] ?? stdout;
  return { validation, whole: stdout.includes("Total document signed") };
}

function sha256(bytes: Buffer): string {
  return createHash("sha256").update(bytes).digest("hex");
}

/** Where the /Contents hex digits sit, found the same way a reader would. */
function contentsHex(bytes: Buffer): { start: number; end: number } {
  const m = /\/ByteRange \[0 (\d+) (\d+) \d+\]/.exec(bytes.toString("latin1"));
  if (!m) throw new Error("no ByteRange");
  return { start: Number(m[1]) + 1, end: Number(m[2]) - 1 };
}

/** Length of the DER blob in /Contents: the outer SEQUENCE's TLV length. */
function cmsLength(bytes: Buffer): number {
  const { start } = contentsHex(bytes);
  const head = Buffer.from(
    bytes.subarray(start, start + 8).toString("latin1"),
    "hex",
  );
  expect(head.subarray(0, 2).toString("hex")).toBe("3082"); // SEQUENCE, 2-byte length
  return 4 + head.readUInt16BE(2);
}

function withByte(bytes: Buffer, at: number, value: number): Buffer {
  const copy = Buffer.from(bytes);
  copy[at] = value;
  return copy;
}

describe("the local signing identity", () => {
  it("is created once, with private files closed to others", async () => {
    expect(oursFiles.created).toBe(true);
    const before = await readFile(oursFiles.p12);
    const second = await ensureLocalSigningIdentity(oursFiles.dir);
    expect(second.created).toBe(false);
    expect((await readFile(second.p12)).equals(before)).toBe(true);
    for (const file of [oursFiles.caKey, oursFiles.p12, oursFiles.p12Password])
      expect((await stat(file)).mode & 0o777).toBe(0o600);
  });

  it("has a CA that may only issue, and a signer NSS accepts for signing", async () => {
    const ca = new X509Certificate(ours.caCertificatePem);
    expect(ca.ca).toBe(true);
    expect(ca.subject).toMatch(
      /CN=Joulebook Local Report Signing CA [0-9a-f]{8}/,
    );
    const years = (c: X509Certificate) =>
      (Date.parse(c.validTo) - Date.parse(c.validFrom)) / (365.25 * 86_400_000);
    expect(years(ca)).toBeCloseTo(10, 1);

    const { stdout } = await run("openssl", [
      "pkcs12",
      "-in",
      path.join(work, "ours/signer.p12"),
      "-passin",
      `pass:${ours.passphrase}`,
      "-nokeys",
      "-clcerts",
    ]);
    const signer = new X509Certificate(
      stdout.slice(stdout.indexOf("-----BEGIN")),
    );
    expect(signer.ca).toBe(false);
    expect(signer.checkIssued(ca) && signer.verify(ca.publicKey)).toBe(true);
    expect(signer.keyUsage).toEqual(
      expect.arrayContaining([EMAIL_PROTECTION, DOCUMENT_SIGNING]),
    );
    expect(years(signer)).toBeCloseTo(3, 1);
    expect(signer.fingerprint256).toBe(ours.signerFingerprint);
    expect(ours.signerName).toMatch(/^Joulebook Report Signer [0-9a-f]{8}$/);
  });

  it("writes the PKCS#12 with a SHA-256 MAC and AES-256 key encryption", async () => {
    const { stdout, stderr } = await run("openssl", [
      "pkcs12",
      "-info",
      "-noout",
      "-in",
      path.join(work, "ours/signer.p12"),
      "-passin",
      `pass:${ours.passphrase}`,
    ]);
    const info = stdout + stderr;
    expect(info).toContain("MAC: sha256");
    expect(info).toContain("AES-256-CBC");
  });

  it("refuses a wrong PKCS#12 password with a sentence", async () => {
    await expect(
      loadSigningIdentity({
        p12Path: path.join(work, "ours/signer.p12"),
        password: "wrong",
      }),
    ).rejects.toThrow(/could not be opened \(wrong password/);
  });

  it("redoes a run that stopped before signer.p12 was written", async () => {
    const dir = path.join(work, "interrupted");
    const first = await ensureLocalSigningIdentity(dir);
    await rm(first.p12);
    await writeFile(`${first.caPem}.abc.tmp`, "half");
    const again = await ensureLocalSigningIdentity(dir);
    expect(again.created).toBe(true);
    const identity = await signingIdentityFrom({ signingDir: dir });
    const ca = new X509Certificate(await readFile(again.caPem));
    expect(
      new X509Certificate(identity.caCertificatePem).raw.equals(ca.raw),
    ).toBe(true);
    await expect(stat(`${first.caPem}.abc.tmp`)).rejects.toThrow();
  }, 30_000);

  it("will not replace a signer whose password file is gone", async () => {
    const dir = path.join(work, "no-password");
    await cp(oursFiles.dir, dir, { recursive: true });
    await rm(path.join(dir, "signer.p12.password"));
    await expect(ensureLocalSigningIdentity(dir)).rejects.toThrow(
      /signer.p12.password is missing/,
    );
  });

  it("loads an operator's PKCS#12 made by OpenSSL 3 with its defaults", async () => {
    const { key, cert } = await operatorPems();
    // The command docs/signing.md gives operators.
    const p12 = path.join(work, "operator.p12");
    await openssl([
      "pkcs12",
      "-export",
      "-inkey",
      key,
      "-in",
      cert,
      "-certfile",
      path.join(work, "theirs/ca.pem"),
      "-out",
      p12,
      "-passout",
      "pass:operator-secret",
    ]);
    const operator = await signingIdentityFrom({
      p12Path: p12,
      p12Password: "operator-secret",
      signingDir: path.join(work, "ours"),
    });
    expect(operator.caCertificatePem).toBe(theirs.caCertificatePem);
    // The local CA in the signing folder stays trusted for older reports.
    expect(operator.trustedCaPems).toEqual([
      theirs.caCertificatePem,
      ours.caCertificatePem,
    ]);
    const result = verifySignedPdf(
      await signPdf(await reportPdf(1), operator),
      operator.trustedCaPems,
    );
    expect(result.ok).toBe(true);
  }, 30_000);
});

/** The other identity's signer key and certificate as PEM files. */
async function operatorPems(): Promise<{ key: string; cert: string }> {
  const source = path.join(work, "theirs/signer.p12");
  const passin = `pass:${theirs.passphrase}`;
  const key = path.join(work, "operator.key.pem");
  const cert = path.join(work, "operator.cert.pem");
  await openssl([
    "pkcs12",
    "-in",
    source,
    "-passin",
    passin,
    "-nocerts",
    "-nodes",
    "-out",
    key,
  ]);
  await openssl([
    "pkcs12",
    "-in",
    source,
    "-passin",
    passin,
    "-clcerts",
    "-nokeys",
    "-out",
    cert,
  ]);
  return { key, cert };
}

async function openssl(args: string[]): Promise<string> {
  return (await run("openssl", args)).stdout;
}

describe("an operator's PKCS#12 without its CA", () => {
  it("is refused with a sentence saying what to include", async () => {
    const { key, cert } = await operatorPems();
    const p12 = path.join(work, "operator-alone.p12");
    await openssl([
      "pkcs12",
      "-export",
      "-inkey",
      key,
      "-in",
      cert,
      "-out",
      p12,
      "-passout",
      "pass:x",
    ]);
    await expect(
      loadSigningIdentity({ p12Path: p12, password: "x" }),
    ).rejects.toThrow(
      /holds no CA certificate for its signer .* Export it with its chain/,
    );
  });
});

describe("a signed report", () => {
  it("is valid and wholly signed for pdfsig", async () => {
    expect(await pdfsig(signed)).toEqual({
      validation: "Signature is Valid.",
      whole: true,
    });
  });

  // What an auditor does: import the downloadable CA certificate into an NSS
  // database (the store Firefox, Thunderbird and pdfsig read) as trusted.
  // npm test installs certutil (libnss3-tools) beside Poppler.
  it("is from a trusted signer once the CA is imported into NSS", async () => {
    const nss = path.join(work, "nss");
    await mkdir(nss);
    const ca = path.join(work, "downloaded-ca.pem");
    await writeFile(ca, ours.caCertificatePem);
    await run("certutil", ["-N", "-d", `sql:${nss}`, "--empty-password"]);
    await run("certutil", [
      "-A",
      "-d",
      `sql:${nss}`,
      "-n",
      "Joulebook CA",
      "-t",
      "C,C,C",
      "-i",
      ca,
    ]);
    const file = path.join(work, "trusted-check.pdf");
    await writeFile(file, signed);
    const { stdout } = await run("pdfsig", ["-nssdir", `sql:${nss}`, file]);
    expect(stdout).toContain("Signature Validation: Signature is Valid.");
    expect(stdout).toContain("Certificate Validation: Certificate is Trusted.");
  }, 30_000);

  it("verifies, and names the signer, the time and the file's hash", () => {
    const result = verifySignedPdf(signed, ours.trustedCaPems);
    expect(result).toMatchObject({
      ok: true,
      sha256: sha256(signed),
      signerName: ours.signerName,
      signerFingerprint: ours.signerFingerprint,
    });
    if (!result.ok) return;
    expect(Math.abs(result.signedAt!.getTime() - Date.now())).toBeLessThan(
      60_000,
    );
    const [a, b, c, d] = result.byteRange;
    expect([a, c + d]).toEqual([0, signed.length]);
    expect(signed.subarray(b, c).toString("latin1")).toMatch(/^<[0-9a-f]+>$/);
  });

  it("refuses a document created with another PDF version", () => {
    const doc = new PDFDocument({ pdfVersion: "1.4" });
    expect(() =>
      addSignaturePlaceholder(doc, {
        reason: "r",
        name: "n",
        location: "l",
        contactInfo: "",
      }),
    ).toThrow(/pdfVersion: "1.7"/);
  });

  it("signs byte for byte as @signpdf's P12Signer, whichever identity", async () => {
    const { P12Signer } = await import("@signpdf/signer-p12");
    const { SignPdf } = await import("@signpdf/signpdf");
    const pdf = await reportPdf(2);
    const at = new Date("2026-01-02T03:04:05Z");
    for (const identity of [ours, theirs]) {
      const reference = await new SignPdf().sign(
        pdf,
        new P12Signer(identity.p12, { passphrase: identity.passphrase }),
        at,
      );
      // Twice: the second signature comes from the cached key.
      for (let i = 0; i < 2; i++)
        expect((await signPdf(pdf, identity, at)).equals(reference)).toBe(true);
    }
  }, 30_000);

  it("signs ten pages in well under a second", async () => {
    const pdf = await reportPdf(10);
    await signPdf(pdf, ours); // first use loads the signer's code paths
    const started = performance.now();
    const result = await signPdf(pdf, ours);
    const ms = performance.now() - started;
    console.info(
      `signing a 10-page report (${result.length} bytes) took ${ms.toFixed(0)} ms`,
    );
    expect(verifySignedPdf(result, ours.trustedCaPems).ok).toBe(true);
    expect(ms).toBeLessThan(2_000);
  }, 30_000);
});

describe("what the verifier refuses, and why", () => {
  it("one changed byte in the signed content: digest mismatch", async () => {
    // Byte 10 is in pdfkit's binary comment line after %PDF-1.7, so the
    // file still parses and only the digest can notice.
    const changed = withByte(signed, 10, signed[10] ^ 0x01);
    expect((await pdfsig(changed)).validation).toBe("Digest Mismatch.");
    expect(verifySignedPdf(changed, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "digest_mismatch",
      message: expect.stringMatching(/changed after it was signed/),
    });
  });

  it("bytes appended after the signed file: not the whole document", async () => {
    const appended = Buffer.concat([
      signed,
      Buffer.from("\n% appended\n%%EOF\n"),
    ]);
    // pdfsig still calls the signature valid, only not total: not enough.
    expect(await pdfsig(appended)).toEqual({
      validation: "Signature is Valid.",
      whole: false,
    });
    expect(verifySignedPdf(appended, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "not_whole_document",
      message: expect.stringMatching(
        /^18 bytes were added after the signed part/,
      ),
    });
  });

  it("a cut-short file: truncated, or not a PDF when the signature is cut off too", () => {
    expect(
      verifySignedPdf(
        signed.subarray(0, signed.length - 100),
        ours.trustedCaPems,
      ),
    ).toMatchObject({
      ok: false,
      reason: "truncated",
      message: expect.stringMatching(/cut short/),
    });
    expect(
      verifySignedPdf(signed.subarray(0, 600), ours.trustedCaPems),
    ).toMatchObject({
      ok: false,
      reason: "not_a_pdf",
    });
  });

  it("an unsigned PDF: no signature", async () => {
    expect(
      verifySignedPdf(await reportPdf(1, false), ours.trustedCaPems),
    ).toMatchObject({
      ok: false,
      reason: "no_signature",
    });
  });

  it("a PDF signed by another local CA: untrusted, unless that CA is trusted too", async () => {
    const foreign = await signPdf(await reportPdf(1), theirs);
    expect(verifySignedPdf(foreign, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "untrusted_certificate",
      message: expect.stringContaining(theirs.signerName),
    });
    const both = [...ours.trustedCaPems, ...theirs.trustedCaPems];
    expect(verifySignedPdf(foreign, both).ok).toBe(true);
  });

  it("a signature made outside the signer's validity: untrusted", async () => {
    const later = await signPdf(
      await reportPdf(1),
      ours,
      new Date(Date.now() + 4 * 365 * 86_400_000),
    );
    expect(verifySignedPdf(later, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "untrusted_certificate",
      message: expect.stringMatching(/was not valid when the file was signed/),
    });
  });

  it("a changed signature value: bad signature", () => {
    const { start } = contentsHex(signed);
    // The RSA signature value is the last element of the CMS blob.
    const at = start + (cmsLength(signed) - 20) * 2;
    const changed = withByte(signed, at, signed[at] === 0x30 ? 0x31 : 0x30);
    expect(verifySignedPdf(changed, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "bad_signature",
    });
  });

  it("an edited copy of the CA inside the signature block: says the block was changed", () => {
    // The CA certificate travels in the CMS blob as DER, written as hex.
    const caHex = new X509Certificate(ours.caCertificatePem).raw
      .toString("hex")
      .toUpperCase();
    const text = signed.toString("latin1");
    const upper = text.toUpperCase();
    const found = upper.indexOf(caHex);
    expect(found).toBeGreaterThan(0);
    // A digit inside the CA's own signature value (its last bytes): the
    // certificate still parses, with the same name, but other bytes.
    const at = found + caHex.length - 10;
    const digit = text[at];
    const changed = withByte(
      signed,
      at,
      (digit === "0" ? "1" : "0").charCodeAt(0),
    );
    const result = verifySignedPdf(changed, ours.trustedCaPems);
    expect(result).toMatchObject({
      ok: false,
      reason: "untrusted_certificate",
    });
    expect(result.ok ? "" : result.message).toMatch(
      /differs from the trusted certificate: the signature block was changed/,
    );
  });

  it("anything in the zero padding after the signature block: malformed", () => {
    const { end } = contentsHex(signed);
    const changed = withByte(signed, end - 5, 0x37);
    expect(verifySignedPdf(changed, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "malformed_signature",
      message: expect.stringMatching(/zero padding/),
    });
  });

  it("a hex digit switched to upper case: malformed", () => {
    const { start, end } = contentsHex(signed);
    const text = signed.subarray(start, end).toString("latin1");
    const at = start + text.search(/[a-f]/);
    const changed = withByte(signed, at, signed[at] - 0x20);
    expect(verifySignedPdf(changed, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "malformed_signature",
    });
  });

  it("something that is not a PDF at all", () => {
    const noise = Buffer.from(
      Array.from({ length: 4096 }, (_, i) => (i * 7919) % 251),
    );
    expect(verifySignedPdf(noise, ours.trustedCaPems)).toMatchObject({
      ok: false,
      reason: "not_a_pdf",
      message: expect.stringMatching(/does not start with %PDF-/),
    });
    expect(verifySignedPdf(Buffer.alloc(0), ours.trustedCaPems).ok).toBe(false);
  });
});

describe("hostile input", () => {
  const verdict = (bytes: Buffer) => verifySignedPdf(bytes, ours.trustedCaPems);

  it("random byte changes anywhere never crash and never pass", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.nat({ max: 1_000_000 }),
            fc.integer({ min: 1, max: 255 }),
          ),
          { minLength: 1, maxLength: 3 },
        ),
        (flips) => {
          const copy = Buffer.from(signed);
          for (const [at, xor] of flips) copy[at % copy.length] ^= xor;
          // The same flip twice cancels out: an unchanged file should pass.
          if (copy.equals(signed)) return true;
          return !verdict(copy).ok;
        },
      ),
      { numRuns: 300 },
    );
  });

  it("single changes inside the signature block never pass", () => {
    const { start, end } = contentsHex(signed);
    fc.assert(
      fc.property(
        fc.integer({ min: start - 1, max: end }),
        fc.integer({ min: 1, max: 255 }),
        (at, xor) => {
          return !verdict(withByte(signed, at, signed[at] ^ xor)).ok;
        },
      ),
      { numRuns: 200 },
    );
  });

  it("a one-bit change anywhere in the signature block is refused", () => {
    const { start } = contentsHex(signed);
    const length = cmsLength(signed);
    // Every byte of the CMS framing (about the first 60) and of the
    // SignerInfo (about the last 600); the two certificates in between are
    // checked by signature or byte for byte, so a sample of them suffices.
    // The zero padding after the block has its own test above.
    const offsets = Array.from({ length }, (_, i) => i).filter(
      (i) => i < 80 || i >= length - 800 || i % 5 === 0,
    );
    const passed = offsets.filter((i) => {
      // The second hex digit of the byte: '0'↔'1', 'b'↔'c', … or a non-digit.
      const at = start + 2 * i + 1;
      return verdict(withByte(signed, at, signed[at] ^ 0x01)).ok;
    });
    expect(passed).toEqual([]);
  }, 30_000);

  it("truncations and appended noise never pass", () => {
    fc.assert(
      fc.property(
        fc.nat({ max: signed.length - 1 }),
        fc.uint8Array({ maxLength: 64 }),
        (cut, tail) => {
          const bytes = Buffer.concat([signed.subarray(0, cut), tail]);
          return !verdict(bytes).ok;
        },
      ),
      { numRuns: 300 },
    );
  });

  it("forged signature dictionaries never crash", () => {
    fc.assert(
      fc.property(
        fc.tuple(fc.nat(), fc.nat(), fc.nat(), fc.nat()),
        fc.stringMatching(/^[0-9a-fA-F ]{0,200}$/),
        (range, hex) => {
          const body = `%PDF-1.7\n1 0 obj << /ByteRange [${range.join(" ")}] /Contents <${hex}> >>\nendobj\n%%EOF`;
          return !verdict(Buffer.from(body, "latin1")).ok;
        },
      ),
      { numRuns: 300 },
    );
  });

  it("a well-placed range around a hex blob of junk is malformed, not a crash", () => {
    const head =
      "%PDF-1.7\n1 0 obj << /ByteRange [0 0000000000 0000000000 0000000000] /Contents ";
    const hex = `<${"30".repeat(4)}${"00".repeat(60)}>`;
    const tail = " >>\nendobj\n%%EOF";
    const b = head.length;
    const c = b + hex.length;
    const end = c + tail.length;
    const pad = (n: number) => String(n).padStart(10, "0");
    const text = `${head.replace("[0 0000000000 0000000000 0000000000]", `[0 ${pad(b)} ${pad(c)} ${pad(end - c)}]`)}${hex}${tail}`;
    expect(verdict(Buffer.from(text, "latin1"))).toMatchObject({
      ok: false,
      reason: "malformed_signature",
    });
  });
});
