import { caCertificatePemFromEnv } from "~/reports/signing/identity.server";

/**
 * The certificate of the CA that signs reports. It is public by nature: an
 * auditor adds it to a PDF reader's trusted certificates to see reports as
 * signed by a trusted identity.
 */
export async function loader() {
  const pem = await caCertificatePemFromEnv();
  return new Response(pem, {
    headers: {
      "Content-Type": "application/x-pem-file",
      "Content-Disposition": 'attachment; filename="joulebook-signing-ca.pem"',
      "Cache-Control": "public, max-age=300",
    },
  });
}
