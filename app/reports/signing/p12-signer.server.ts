/**
 * @signpdf's P12Signer, with the same PKCS#7 (adbe.pkcs7.detached, SHA-256,
 * the same certificates and signed attributes, byte for byte) made faster in
 * the two places that cost most of a report's signing time:
 *
 *  - The PKCS#12 file is decrypted once per file and passphrase, not once per
 *    signature (PBKDF2 with 2048 rounds in JavaScript each time).
 *  - The RSA private-key operation runs in node:crypto (OpenSSL) instead of
 *    node-forge's JavaScript big integers: PKCS#1 v1.5 signing is
 *    deterministic, so the signature bytes are the same.
 *
 * forge still builds the SignedData structure and digests the content.
 */
import {
  constants,
  createHash,
  createPrivateKey,
  privateEncrypt,
  type KeyObject,
} from "node:crypto";
import { Signer, SignPdfError } from "@signpdf/signpdf";
import forge from "node-forge";

const { asn1, pki } = forge;

interface ParsedP12 {
  certificates: forge.pki.Certificate[];
  signerCertificate: forge.pki.Certificate;
  privateKey: forge.pki.rsa.PrivateKey;
  nativeKey: KeyObject;
}

// A process signs with one or two identities; keyed by a hash of the file
// and passphrase, so a re-read identity hits and a changed one does not.
const parsed = new Map<string, ParsedP12>();
const MAX_CACHED = 8;

function parseP12(p12: Buffer, passphrase: string): ParsedP12 {
  const key = createHash("sha256")
    .update(p12)
    .update("\0")
    .update(passphrase)
    .digest("hex");
  const hit = parsed.get(key);
  if (hit) return hit;
  // As P12Signer reads it: every certificate bag in order, the first key bag.
  const p12Asn1 = asn1.fromDer(forge.util.createBuffer(p12.toString("binary")));
  const pfx = forge.pkcs12.pkcs12FromAsn1(p12Asn1, false, passphrase);
  const certBags = pfx.getBags({ bagType: pki.oids.certBag })[pki.oids.certBag];
  const keyBags = pfx.getBags({ bagType: pki.oids.pkcs8ShroudedKeyBag })[
    pki.oids.pkcs8ShroudedKeyBag
  ];
  const privateKey = keyBags?.[0]?.key as forge.pki.rsa.PrivateKey | undefined;
  const certificates = (certBags ?? []).flatMap((bag) =>
    bag.cert ? [bag.cert] : [],
  );
  if (!privateKey)
    throw new SignPdfError(
      "The PKCS#12 file holds no private key.",
      SignPdfError.TYPE_INPUT,
    );
  // The last certificate that matches the private key, as P12Signer picks it.
  const signerCertificate = certificates.findLast((cert) => {
    const publicKey = cert.publicKey as forge.pki.rsa.PublicKey;
    return (
      privateKey.n.compareTo(publicKey.n) === 0 &&
      privateKey.e.compareTo(publicKey.e) === 0
    );
  });
  if (!signerCertificate)
    throw new SignPdfError(
      "Failed to find a certificate that matches the private key.",
      SignPdfError.TYPE_INPUT,
    );
  const entry = {
    certificates,
    signerCertificate,
    privateKey,
    nativeKey: createPrivateKey(pki.privateKeyToPem(privateKey)),
  };
  if (parsed.size >= MAX_CACHED) parsed.clear();
  parsed.set(key, entry);
  return entry;
}

/** DER of the PKCS#1 DigestInfo of a finished forge digest (RFC 8017 §9.2). */
function digestInfo(md: forge.md.MessageDigest): Buffer {
  const oid = pki.oids[md.algorithm];
  const der = asn1.toDer(
    asn1.create(asn1.Class.UNIVERSAL, asn1.Type.SEQUENCE, true, [
      asn1.create(asn1.Class.UNIVERSAL, asn1.Type.SEQUENCE, true, [
        asn1.create(
          asn1.Class.UNIVERSAL,
          asn1.Type.OID,
          false,
          asn1.oidToDer(oid).getBytes(),
        ),
        asn1.create(asn1.Class.UNIVERSAL, asn1.Type.NULL, false, ""),
      ]),
      asn1.create(
        asn1.Class.UNIVERSAL,
        asn1.Type.OCTETSTRING,
        false,
        md.digest().getBytes(),
      ),
    ]),
  );
  return Buffer.from(der.getBytes(), "binary");
}

/** forge's key, whose RSASSA-PKCS1-v1_5 signing is done by OpenSSL. */
function nativelySigningKey(p: ParsedP12): forge.pki.rsa.PrivateKey {
  const key = Object.create(p.privateKey) as forge.pki.rsa.PrivateKey;
  key.sign = (md: forge.md.MessageDigest, scheme?: unknown) => {
    if (scheme !== undefined && scheme !== "RSASSA-PKCS1-V1_5")
      throw new Error(`unexpected RSA signature scheme ${String(scheme)}`);
    return privateEncrypt(
      { key: p.nativeKey, padding: constants.RSA_PKCS1_PADDING },
      digestInfo(md),
    ).toString("binary");
  };
  return key;
}

export class CachedP12Signer extends Signer {
  constructor(
    private readonly p12: Buffer,
    private readonly passphrase: string,
  ) {
    super();
  }

  async sign(pdfBuffer: Buffer, signingTime?: Date): Promise<Buffer> {
    const p = parseP12(this.p12, this.passphrase);
    const p7 = forge.pkcs7.createSignedData();
    p7.content = forge.util.createBuffer(pdfBuffer.toString("binary"));
    for (const cert of p.certificates) p7.addCertificate(cert);
    // The attributes' order matters to some validators; P12Signer's order.
    p7.addSigner({
      key: nativelySigningKey(p),
      certificate: p.signerCertificate,
      digestAlgorithm: pki.oids.sha256,
      authenticatedAttributes: [
        { type: pki.oids.contentType, value: pki.oids.data },
        // forge's typings want a string; it encodes a Date as UTCTime.
        {
          type: pki.oids.signingTime,
          value: (signingTime ?? new Date()) as unknown as string,
        },
        { type: pki.oids.messageDigest },
      ],
    });
    p7.sign({ detached: true });
    return Buffer.from(asn1.toDer(p7.toAsn1()).getBytes(), "binary");
  }
}
