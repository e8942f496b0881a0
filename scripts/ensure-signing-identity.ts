/**
 * npm start runs this before the server: with no REPORT_SIGNING_P12, it
 * creates the local report-signing CA and signer in SIGNING_DIR once
 * (default .data/signing) and says what it found or made.
 *
 *   node --import tsx scripts/ensure-signing-identity.ts
 *
 * Reads process.env directly: it must work before DATABASE_URL is known.
 */
import { X509Certificate } from "node:crypto";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { loadSigningIdentity } from "../app/reports/signing/identity.server";
import { ensureLocalSigningIdentity } from "../app/reports/signing/local-files.server";

async function main(): Promise<void> {
  const p12Path = process.env.REPORT_SIGNING_P12;
  if (p12Path) {
    // Open it now, so a wrong path or password stops the start, not a report.
    const identity = await loadSigningIdentity({
      p12Path,
      password: process.env.REPORT_SIGNING_P12_PASSWORD ?? "",
    });
    console.log(
      `Report signing: ${identity.signerName} from ${p12Path} (REPORT_SIGNING_P12)`,
    );
    printCa(new X509Certificate(identity.caCertificatePem));
    return;
  }
  const dir = path.resolve(process.env.SIGNING_DIR || ".data/signing");
  const started = performance.now();
  const files = await ensureLocalSigningIdentity(dir);
  const what = files.created
    ? `created a local signing CA and signer (${Math.round(performance.now() - started)} ms)`
    : "using the local signing identity";
  console.log(
    `Report signing: ${what} in ${path.relative(process.cwd(), dir) || "."}`,
  );
  printCa(new X509Certificate(await readFile(files.caPem)));
}

function printCa(ca: X509Certificate): void {
  console.log(
    `  CA: ${ca.subject.split("\n").join(", ")}, valid until ${ca.validTo}`,
  );
  console.log(`  CA SHA-256 fingerprint: ${ca.fingerprint256}`);
}

main().catch((error: unknown) => {
  console.error(
    `Report signing: ${error instanceof Error ? error.message : String(error)}`,
  );
  process.exit(1);
});
