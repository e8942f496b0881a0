/**
 * Signing a pdfkit document: a placeholder signature dictionary goes in
 * before `doc.end()`, and the finished bytes are signed (adbe.pkcs7.detached,
 * SHA-256) with the PKCS#12 identity.
 *
 * The document must be created with `pdfVersion: REPORT_PDF_VERSION`: 1.7 is
 * the version readers expect for SHA-256 signatures.
 */
import { pdfkitAddPlaceholder } from "@signpdf/placeholder-pdfkit";
import { SignPdf } from "@signpdf/signpdf";
import type { SigningIdentity } from "./identity.server";
import { CachedP12Signer } from "./p12-signer.server";

export const REPORT_PDF_VERSION = "1.7";

/**
 * Room for the PKCS#7 blob, in bytes (written as twice as many hex digits).
 * A 3072-bit signature with two certificates is about 2.5 kB; this leaves
 * room for an operator's longer chain.
 */
export const SIGNATURE_PLACEHOLDER_BYTES = 8192;

export interface SignatureInfo {
  reason: string;
  name: string;
  location: string;
  contactInfo: string;
}

/** Call once, after the content is drawn and before `doc.end()`. */
export function addSignaturePlaceholder(
  doc: PDFKit.PDFDocument,
  info: SignatureInfo,
): void {
  if (doc.version !== Number(REPORT_PDF_VERSION))
    throw new Error(
      `Create signed documents with pdfVersion: "${REPORT_PDF_VERSION}" (this one is ${doc.version}).`,
    );
  pdfkitAddPlaceholder({
    pdf: doc,
    // Only read by the plain-PDF placeholder variant; pdfkit needs none.
    pdfBuffer: Buffer.alloc(0),
    reason: info.reason,
    name: info.name,
    location: info.location,
    contactInfo: info.contactInfo,
    signatureLength: SIGNATURE_PLACEHOLDER_BYTES,
    appName: "Joulebook",
  });
}

/** Fills the placeholder of a finished document with the signature. */
export async function signPdf(
  pdfWithPlaceholder: Buffer,
  identity: Pick<SigningIdentity, "p12" | "passphrase">,
  signingTime: Date = new Date(),
): Promise<Buffer> {
  // P12Signer's PKCS#7, byte for byte, without its per-call PKCS#12
  // decryption and JavaScript RSA (p12-signer.server.ts).
  const signer = new CachedP12Signer(identity.p12, identity.passphrase);
  return new SignPdf().sign(pdfWithPlaceholder, signer, signingTime);
}
