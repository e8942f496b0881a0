/**
 * What verifying an uploaded PDF answers, on the Verify page and from
 * `POST …/reports/verify` (verify-upload.server.ts builds it).
 */
import { z } from "zod";
import { id } from "~/lib/wire-schemas";

const signature = {
  sha256: z.string().describe("Hex SHA-256 of the whole file"),
  signerName: z.string(),
  signedAt: z.iso.datetime().nullable(),
};

export const verifyOutcomeSchema = z.discriminatedUnion("verdict", [
  z.strictObject({
    verdict: z.literal("genuine"),
    ...signature,
    report: z.strictObject({
      id: id(),
      title: z.string(),
      completedAt: z.iso.datetime().nullable(),
      authorName: z.string().nullable(),
      authorEmail: z.string().nullable(),
    }),
  }),
  z.strictObject({
    verdict: z.literal("not_issued_here"),
    ...signature,
    message: z.string(),
  }),
  z.strictObject({
    verdict: z.literal("invalid"),
    reason: z.enum([
      "not_a_pdf",
      "no_signature",
      "malformed_signature",
      "truncated",
      "not_whole_document",
      "digest_mismatch",
      "bad_signature",
      "untrusted_certificate",
    ]),
    message: z.string(),
  }),
]);
export type VerifyOutcome = z.output<typeof verifyOutcomeSchema>;
