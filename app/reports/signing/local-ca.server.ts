/**
 * A local signing CA and the report signer it issues, for installs that bring
 * no certificate of their own. A lone self-signed certificate cannot be
 * trusted in NSS-based readers, so the signer is issued by a CA, and the CA
 * certificate is what an auditor imports.
 *
 * Keys come from node:crypto (native, about 0.1–1 s) and are handed to
 * node-forge, which builds the X.509 certificates and the PKCS#12 file.
 */
import { generateKeyPairSync, randomBytes } from "node:crypto";
import forge from "node-forge";
import { buildPkcs12 } from "./pkcs12.server";

const { pki } = forge;

const CA_KEY_BITS = 3072;
const SIGNER_KEY_BITS = 3072;
const CA_YEARS = 10;
const SIGNER_YEARS = 3;
/** PDF signing (RFC 9336); NSS also needs emailProtection, added beside it. */
const OID_DOCUMENT_SIGNING = "1.3.6.1.5.5.7.3.36";

export interface LocalSigningIdentity {
  caCertificatePem: string;
  caPrivateKeyPem: string;
  p12: Buffer;
  p12Password: string;
  /** Random per install, so two installs' CAs never share a name. */
  installSuffix: string;
}

export function createLocalSigningIdentity(
  now: Date = new Date(),
): LocalSigningIdentity {
  const installSuffix = randomBytes(4).toString("hex");
  const ca = newKeyPair(CA_KEY_BITS);
  const caCert = buildCaCertificate(ca, installSuffix, now);
  const signer = newKeyPair(SIGNER_KEY_BITS);
  const signerCert = buildSignerCertificate(
    signer,
    caCert,
    ca,
    installSuffix,
    now,
  );
  const p12Password = randomBytes(24).toString("base64url");
  return {
    caCertificatePem: unixLines(pki.certificateToPem(caCert)),
    caPrivateKeyPem: unixLines(pki.privateKeyToPem(ca.privateKey)),
    p12: buildPkcs12({
      privateKey: signer.privateKey,
      certificates: [signerCert, caCert],
      password: p12Password,
      friendlyName: `Joulebook Report Signer ${installSuffix}`,
    }),
    p12Password,
    installSuffix,
  };
}

/** forge writes PEM with CRLF; files and downloads use plain newlines. */
function unixLines(pem: string): string {
  return pem.replace(/\r\n/g, "\n");
}

interface ForgeKeyPair {
  privateKey: forge.pki.rsa.PrivateKey;
  publicKey: forge.pki.rsa.PublicKey;
}

function newKeyPair(modulusLength: number): ForgeKeyPair {
  const { privateKey } = generateKeyPairSync("rsa", {
    modulusLength,
    privateKeyEncoding: { type: "pkcs8", format: "pem" },
    publicKeyEncoding: { type: "spki", format: "pem" },
  });
  const forgeKey = pki.privateKeyFromPem(
    privateKey,
  ) as forge.pki.rsa.PrivateKey;
  return {
    privateKey: forgeKey,
    publicKey: pki.rsa.setPublicKey(forgeKey.n, forgeKey.e),
  };
}

/** 16 random bytes with the top bit clear: a positive serial (RFC 5280 §4.1.2.2). */
function randomSerial(): string {
  const bytes = randomBytes(16);
  bytes[0] &= 0x7f;
  return bytes.toString("hex");
}

function validity(cert: forge.pki.Certificate, now: Date, years: number) {
  // An hour of slack for clocks that are a little behind ours.
  cert.validity.notBefore = new Date(now.getTime() - 60 * 60 * 1000);
  const notAfter = new Date(now);
  notAfter.setUTCFullYear(notAfter.getUTCFullYear() + years);
  cert.validity.notAfter = notAfter;
}

function buildCaCertificate(
  keys: ForgeKeyPair,
  suffix: string,
  now: Date,
): forge.pki.Certificate {
  const cert = pki.createCertificate();
  cert.publicKey = keys.publicKey;
  cert.serialNumber = randomSerial();
  validity(cert, now, CA_YEARS);
  const subject = [
    {
      name: "commonName",
      value: `Joulebook Local Report Signing CA ${suffix}`,
    },
    { name: "organizationName", value: "Joulebook (local install)" },
  ];
  cert.setSubject(subject);
  cert.setIssuer(subject);
  cert.setExtensions([
    { name: "basicConstraints", cA: true, critical: true },
    { name: "keyUsage", keyCertSign: true, cRLSign: true, critical: true },
    { name: "subjectKeyIdentifier" },
  ]);
  cert.sign(keys.privateKey, forge.md.sha256.create());
  return cert;
}

function buildSignerCertificate(
  keys: ForgeKeyPair,
  caCert: forge.pki.Certificate,
  caKeys: ForgeKeyPair,
  suffix: string,
  now: Date,
): forge.pki.Certificate {
  const cert = pki.createCertificate();
  cert.publicKey = keys.publicKey;
  cert.serialNumber = randomSerial();
  validity(cert, now, SIGNER_YEARS);
  cert.setSubject([
    { name: "commonName", value: `Joulebook Report Signer ${suffix}` },
    { name: "organizationName", value: "Joulebook (local install)" },
  ]);
  cert.setIssuer(caCert.subject.attributes);
  cert.setExtensions([
    { name: "basicConstraints", cA: false, critical: true },
    {
      name: "keyUsage",
      digitalSignature: true,
      nonRepudiation: true,
      critical: true,
    },
    {
      name: "extKeyUsage",
      emailProtection: true,
      [OID_DOCUMENT_SIGNING]: true,
    },
    { name: "subjectKeyIdentifier" },
    {
      name: "authorityKeyIdentifier",
      keyIdentifier: caCert.generateSubjectKeyIdentifier().getBytes(),
    },
  ]);
  cert.sign(caKeys.privateKey, forge.md.sha256.create());
  return cert;
}
