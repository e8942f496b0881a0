/**
 * Checks an uploaded PDF's embedded signature, and says exactly why when it
 * fails. In order: is it a PDF; is there a signature; does it cover the whole
 * file (ISO 32000-1 §12.8.1: everything but the /Contents hex string); does
 * the SHA-256 of the signed bytes equal the signed messageDigest attribute
 * (RFC 5652 §5.4); does the signer's key verify the signed attributes; does
 * the signer chain to a CA this server trusts, and was it valid when signed.
 *
 * pdfsig (Poppler) accepts bytes appended after a signature ("Not total
 * document signed"); this check refuses them. Hostile input never throws:
 * anything unreadable is `malformed_signature`.
 */
import { createHash, verify, X509Certificate } from "node:crypto";
import {
  checkCoverage,
  findByteRange,
  hasEofMarker,
  hasPdfHeader,
  signedParts,
  type ByteRange,
  type ByteRangeProblem,
} from "./byte-range";
import { MalformedCms, readDetachedCms, type DetachedCms } from "./cms.server";

export type VerifyFailureReason =
  | ByteRangeProblem
  | "digest_mismatch"
  | "bad_signature"
  | "untrusted_certificate";

export type VerifyResult =
  | {
      ok: true;
      /** Hex SHA-256 of the whole file: the key to the issued report. */
      sha256: string;
      signedAt: Date | null;
      signerName: string;
      signerFingerprint: string;
      byteRange: ByteRange;
    }
  | {
      ok: false;
      reason: VerifyFailureReason;
      /** One sentence for the person who uploaded the file. */
      message: string;
      sha256: string;
    };

type Failure = Extract<VerifyResult, { ok: false }>;

/** Verification chains are short; this bounds the walk on hostile input. */
const MAX_CHAIN = 5;

export function verifySignedPdf(
  bytes: Buffer,
  trustedCaPems: string[],
): VerifyResult {
  // Trusted CAs come from the server's own configuration: a bad one throws.
  const trusted = trustedCaPems.map((pem) => new X509Certificate(pem));
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const failure = (reason: VerifyFailureReason, message: string): Failure => ({
    ok: false,
    reason,
    message,
    sha256,
  });
  try {
    return check(bytes, trusted, sha256, failure);
  } catch (error) {
    const detail = error instanceof Error ? error.message : String(error);
    return failure(
      "malformed_signature",
      error instanceof MalformedCms
        ? `The signature cannot be checked: ${detail}.`
        : `The signature cannot be read (${detail}).`,
    );
  }
}

function check(
  bytes: Buffer,
  trusted: X509Certificate[],
  sha256: string,
  failure: (reason: VerifyFailureReason, message: string) => Failure,
): VerifyResult {
  if (!hasPdfHeader(bytes))
    return failure(
      "not_a_pdf",
      "The file does not start with %PDF-, so it is not a PDF.",
    );
  const range = findByteRange(bytes);
  if (!range)
    return hasEofMarker(bytes)
      ? failure(
          "no_signature",
          "The PDF has no embedded signature (no /ByteRange).",
        )
      : missingEof(failure);
  if (!range.ok) return failure(range.reason, range.message);
  const coverage = checkCoverage(bytes, range.value);
  if (!coverage.ok) return failure(coverage.reason, coverage.message);
  if (!hasEofMarker(bytes)) return missingEof(failure);
  const { hexStart, hexEnd } = coverage.value;
  const cms = readDetachedCms(
    decodeSignatureHex(bytes.subarray(hexStart, hexEnd)),
  );
  const problem =
    digestProblem(bytes, range.value, cms) ??
    signatureProblem(cms) ??
    chainProblem(cms, trusted);
  if (problem) return failure(problem.reason, problem.message);
  return {
    ok: true,
    sha256,
    signedAt: cms.signingTime,
    signerName: commonName(cms.signer),
    signerFingerprint: cms.signer.fingerprint256,
    byteRange: range.value,
  };
}

function missingEof(failure: (r: VerifyFailureReason, m: string) => Failure) {
  return failure(
    "not_a_pdf",
    "The file does not end with %%EOF: it is cut short or is not a complete PDF.",
  );
}

/**
 * The hex string's digits must all be one case: a reader decodes `a` and `A`
 * alike, so mixed case would let a byte change go unnoticed.
 */
function decodeSignatureHex(hex: Buffer): Buffer {
  const text = hex.toString("latin1");
  if (/[a-f]/.test(text) && /[A-F]/.test(text))
    throw new MalformedCms(
      "the signature value mixes upper- and lower-case hex digits",
    );
  return Buffer.from(text, "hex");
}

interface Problem {
  reason: VerifyFailureReason;
  message: string;
}

function digestProblem(
  bytes: Buffer,
  range: ByteRange,
  cms: DetachedCms,
): Problem | null {
  const hash = createHash(cms.digestAlgorithm);
  for (const part of signedParts(bytes, range)) hash.update(part);
  if (hash.digest().equals(cms.messageDigest)) return null;
  return {
    reason: "digest_mismatch",
    message: `The ${cms.digestAlgorithm.toUpperCase()} of the signed bytes differs from the one in the signature: the file was changed after it was signed.`,
  };
}

function signatureProblem(cms: DetachedCms): Problem | null {
  const valid = verify(
    cms.digestAlgorithm,
    cms.signedAttributes,
    cms.signer.publicKey,
    cms.signature,
  );
  if (valid) return null;
  return {
    reason: "bad_signature",
    message: `The signature value does not verify with the public key of ${commonName(cms.signer)}: the signature itself was altered or made with another key.`,
  };
}

/**
 * Walks signer → embedded intermediates → a trusted CA, checking each
 * certificate was valid when the signature was made. Every embedded
 * certificate must be on that path or be a trusted CA itself, so none of
 * them is an unchecked passenger.
 */
function chainProblem(
  cms: DetachedCms,
  trusted: X509Certificate[],
): Problem | null {
  const at = cms.signingTime ?? new Date();
  const path = [cms.signer];
  let anchor: X509Certificate | undefined;
  while (!anchor && path.length <= MAX_CHAIN) {
    const current = path[path.length - 1];
    anchor = trusted.find((ca) => issuedBy(current, ca));
    if (anchor) break;
    const next = cms.certificates.find(
      (c) => c.ca && !path.includes(c) && issuedBy(current, c),
    );
    if (!next) break;
    path.push(next);
  }
  if (!anchor)
    return untrusted(
      `The signer ${commonName(cms.signer)} was not issued by a CA this server trusts (issuer: ${oneLine(path[path.length - 1].issuer)}).`,
    );
  const expired = [...path, anchor].find((cert) => !validAt(cert, at));
  if (expired)
    return untrusted(
      `The certificate ${commonName(expired)} was not valid when the file was signed (${at.toISOString()}; valid ${expired.validFrom} to ${expired.validTo}).`,
    );
  const passenger = cms.certificates.find(
    (c) => !path.includes(c) && !trusted.some((t) => t.raw.equals(c.raw)),
  );
  if (!passenger) return null;
  // Same name as a trusted CA but other bytes: most likely the signature
  // block itself was edited, which is what a reader should be told.
  if (trusted.some((t) => t.subject === passenger.subject))
    return untrusted(
      `The signature carries a copy of ${commonName(passenger)} that differs from the trusted certificate: the signature block was changed after signing.`,
    );
  return untrusted(
    `The signature carries a certificate (${commonName(passenger)}) that is neither on the signer's chain nor a trusted CA.`,
  );
}

function untrusted(message: string): Problem {
  return { reason: "untrusted_certificate", message };
}

function issuedBy(cert: X509Certificate, issuer: X509Certificate): boolean {
  return cert.checkIssued(issuer) && cert.verify(issuer.publicKey);
}

function validAt(cert: X509Certificate, at: Date): boolean {
  const from = Date.parse(cert.validFrom);
  const to = Date.parse(cert.validTo);
  return from <= at.getTime() && at.getTime() <= to;
}

function commonName(cert: X509Certificate): string {
  const cn = cert.subject.split("\n").find((line) => line.startsWith("CN="));
  return cn ? cn.slice(3) : oneLine(cert.subject);
}

function oneLine(name: string): string {
  return name.split("\n").join(", ");
}
