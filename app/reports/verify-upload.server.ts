/**
 * What the Verify page answers for an uploaded PDF: the signature and its
 * coverage first (is the file intact and signed by a certificate we trust?),
 * then whether this organisation issued exactly these bytes.
 */
import type { VerifyOutcome } from "./verify-outcome";
import { findIssuedReport } from "./reports.server";
import { signingIdentityFromEnv } from "./signing/identity.server";
import { verifySignedPdf } from "./signing/verify-pdf.server";

/** The answer's shape is the API's (`POST …/reports/verify`). */
export type { VerifyOutcome } from "./verify-outcome";

export async function verifyUploadedReport(
  organizationId: string,
  bytes: Buffer,
): Promise<VerifyOutcome> {
  const identity = await signingIdentityFromEnv();
  const result = await verifySignedPdf(bytes, identity.trustedCaPems);
  if (!result.ok)
    return {
      verdict: "invalid",
      reason: result.reason,
      message: result.message,
    };
  const signedAt = result.signedAt ? result.signedAt.toISOString() : null;
  const report = await findIssuedReport(organizationId, result.sha256);
  if (!report)
    return {
      verdict: "not_issued_here",
      sha256: result.sha256,
      signerName: result.signerName,
      signedAt,
      message:
        "The signature is valid and covers the whole file, but this organisation has no report with exactly these bytes. It may have been issued to another organisation, or deleted.",
    };
  return {
    verdict: "genuine",
    sha256: result.sha256,
    signerName: result.signerName,
    signedAt,
    report,
  };
}
