/**
 * Which certificate signs reports, and which CAs the Verify page trusts.
 *
 * An operator's PKCS#12 (REPORT_SIGNING_P12 + REPORT_SIGNING_P12_PASSWORD)
 * wins; otherwise the local identity in SIGNING_DIR is used, created on first
 * need. The identity is read once per process and kept in memory.
 */
import { X509Certificate } from "node:crypto";
import { existsSync } from "node:fs";
import { readFile } from "node:fs/promises";
import path from "node:path";
import forge from "node-forge";
import { env } from "~/env.server";
import {
  ensureLocalSigningIdentity,
  signingFilePaths,
} from "./local-files.server";
import { readPkcs12 } from "./pkcs12.server";

export { ensureLocalSigningIdentity, signingFilePaths };
export type { LocalIdentityFiles } from "./local-files.server";

export interface SigningIdentity {
  p12: Buffer;
  passphrase: string;
  /** The signer certificate's common name, shown in the PDF and on Verify. */
  signerName: string;
  /** SHA-256 of the signer certificate, as `AB:CD:…`. */
  signerFingerprint: string;
  /** The root CA of the signer's chain: what an auditor imports. */
  caCertificatePem: string;
  /** CAs whose signatures the Verify page accepts. */
  trustedCaPems: string[];
}

export async function loadSigningIdentity(opts: {
  p12Path: string;
  password: string;
  caPemPath?: string;
}): Promise<SigningIdentity> {
  const p12 = await readFile(opts.p12Path);
  const contents = readPkcs12(p12, opts.password);
  const signer = new X509Certificate(
    forge.pki.certificateToPem(contents.signerCertificate),
  );
  const chain = contents.chain.map(
    (cert) => new X509Certificate(forge.pki.certificateToPem(cert)),
  );
  const caPem = opts.caPemPath
    ? await readFile(opts.caPemPath, "utf8")
    : undefined;
  const root = caPem
    ? caThatIssuedChain(signer, chain, new X509Certificate(caPem), opts)
    : rootOfChain(signer, chain, opts.p12Path);
  return {
    p12,
    passphrase: opts.password,
    signerName:
      contents.signerCertificate.subject.getField("CN")?.value ??
      signer.subject,
    signerFingerprint: signer.fingerprint256,
    caCertificatePem: root.toString(),
    trustedCaPems: [root.toString()],
  };
}

/** Follows issuers through the PKCS#12's own certificates to the top. */
function rootOfChain(
  signer: X509Certificate,
  chain: X509Certificate[],
  p12Path: string,
): X509Certificate {
  let current = signer;
  for (let depth = 0; depth <= chain.length; depth++) {
    if (issuedBy(current, current)) return current;
    const issuer = chain.find((c) => c !== current && issuedBy(current, c));
    if (!issuer) break;
    current = issuer;
  }
  if (current !== signer) return current;
  throw new Error(
    `${p12Path} holds no CA certificate for its signer (${signer.subject.replace(/\n/g, ", ")}). Export it with its chain, e.g. openssl pkcs12 -export -certfile ca.pem …`,
  );
}

function caThatIssuedChain(
  signer: X509Certificate,
  chain: X509Certificate[],
  ca: X509Certificate,
  opts: { p12Path: string; caPemPath?: string },
): X509Certificate {
  const reachable = [signer, ...chain].some((c) => issuedBy(c, ca));
  if (!reachable)
    throw new Error(
      `${opts.caPemPath} did not issue the certificate in ${opts.p12Path}; the signing files do not belong together.`,
    );
  return ca;
}

function issuedBy(cert: X509Certificate, issuer: X509Certificate): boolean {
  return cert.checkIssued(issuer) && cert.verify(issuer.publicKey);
}

export interface SigningSettings {
  p12Path?: string;
  p12Password?: string;
  signingDir: string;
}

/**
 * The identity for these settings. With an operator's PKCS#12, a local CA
 * left in the signing folder stays trusted, so reports signed before the
 * switch still verify.
 */
export async function signingIdentityFrom(
  settings: SigningSettings,
): Promise<SigningIdentity> {
  if (settings.p12Path) {
    const identity = await loadSigningIdentity({
      p12Path: settings.p12Path,
      password: settings.p12Password ?? "",
    });
    const localCa = signingFilePaths(settings.signingDir).caPem;
    if (existsSync(localCa)) {
      const pem = new X509Certificate(await readFile(localCa)).toString();
      if (!identity.trustedCaPems.includes(pem))
        identity.trustedCaPems = [...identity.trustedCaPems, pem];
    }
    return identity;
  }
  const files = await ensureLocalSigningIdentity(settings.signingDir);
  return loadSigningIdentity({
    p12Path: files.p12,
    password: (await readFile(files.p12Password, "utf8")).trim(),
    caPemPath: existsSync(files.caPem) ? files.caPem : undefined,
  });
}

let cached: Promise<SigningIdentity> | undefined;

export function signingIdentityFromEnv(): Promise<SigningIdentity> {
  if (!cached) {
    const e = env();
    cached = signingIdentityFrom({
      p12Path: e.REPORT_SIGNING_P12,
      p12Password: e.REPORT_SIGNING_P12_PASSWORD,
      signingDir: path.resolve(e.SIGNING_DIR),
    });
    // A failed load (say, the disk was full) is tried again next time.
    cached.catch(() => {
      cached = undefined;
    });
  }
  return cached;
}

/** The CA certificate for the public download route. */
export async function caCertificatePemFromEnv(): Promise<string> {
  return (await signingIdentityFromEnv()).caCertificatePem;
}
