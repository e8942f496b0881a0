/**
 * PKCS#12 files for the report signer, written and read with node-forge.
 *
 * node-forge writes the PKCS#12 integrity MAC with SHA-1 only, but reads
 * SHA-256. So the file is assembled without forge's MAC and a SHA-256 MAC is
 * added here, derived as RFC 7292 Appendix B prescribes (ID 3 = MAC key),
 * which is what OpenSSL 3 writes by default as well.
 */
import forge from "node-forge";

const { asn1, pki } = forge;

/** OpenSSL 3's default iteration count for both the key and the MAC. */
const ITERATIONS = 2048;
const MAC_SALT_BYTES = 16;
const SHA256_BYTES = 32;

export interface Pkcs12Contents {
  privateKey: forge.pki.rsa.PrivateKey;
  /** The certificate whose public key matches the private key. */
  signerCertificate: forge.pki.Certificate;
  /** Every other certificate in the file (the issuing CA and any chain). */
  chain: forge.pki.Certificate[];
}

type Pkcs12Options = NonNullable<
  Parameters<typeof forge.pkcs12.toPkcs12Asn1>[3]
>;

export function buildPkcs12(input: {
  privateKey: forge.pki.rsa.PrivateKey;
  certificates: forge.pki.Certificate[];
  password: string;
  friendlyName: string;
}): Buffer {
  // forge hands prfAlgorithm on to PBES2 (PBKDF2 with HMAC-SHA-256 instead
  // of HMAC-SHA-1); its typings omit the option.
  const options: Pkcs12Options & { prfAlgorithm: "sha256" } = {
    algorithm: "aes256",
    prfAlgorithm: "sha256",
    count: ITERATIONS,
    useMac: false,
    generateLocalKeyId: true,
    friendlyName: input.friendlyName,
  };
  const pfx = forge.pkcs12.toPkcs12Asn1(
    input.privateKey,
    input.certificates,
    input.password,
    options,
  );
  const parts = pfx.value as forge.asn1.Asn1[];
  parts.push(sha256MacData(authSafeBytes(pfx), input.password));
  return Buffer.from(asn1.toDer(pfx).getBytes(), "binary");
}

/** The DER of the AuthenticatedSafe: what the PFX MAC is computed over. */
function authSafeBytes(pfx: forge.asn1.Asn1): string {
  const authSafe = (pfx.value as forge.asn1.Asn1[])[1];
  const explicit = (authSafe.value as forge.asn1.Asn1[])[1];
  const octets = (explicit.value as forge.asn1.Asn1[])[0];
  return octets.value as string;
}

function sha256MacData(data: string, password: string): forge.asn1.Asn1 {
  const salt = forge.random.getBytesSync(MAC_SALT_BYTES);
  const md = forge.md.sha256.create();
  const key = forge.pkcs12.generateKey(
    password,
    forge.util.createBuffer(salt),
    3,
    ITERATIONS,
    SHA256_BYTES,
    md,
  );
  const hmac = forge.hmac.create();
  hmac.start(md, key);
  hmac.update(data);
  const { UNIVERSAL } = asn1.Class;
  const T = asn1.Type;
  return asn1.create(UNIVERSAL, T.SEQUENCE, true, [
    asn1.create(UNIVERSAL, T.SEQUENCE, true, [
      asn1.create(UNIVERSAL, T.SEQUENCE, true, [
        asn1.create(
          UNIVERSAL,
          T.OID,
          false,
          asn1.oidToDer(pki.oids.sha256).getBytes(),
        ),
        asn1.create(UNIVERSAL, T.NULL, false, ""),
      ]),
      asn1.create(UNIVERSAL, T.OCTETSTRING, false, hmac.digest().getBytes()),
    ]),
    asn1.create(UNIVERSAL, T.OCTETSTRING, false, salt),
    asn1.create(
      UNIVERSAL,
      T.INTEGER,
      false,
      asn1.integerToDer(ITERATIONS).getBytes(),
    ),
  ]);
}

/**
 * Opens a PKCS#12 file. Throws with a sentence an operator can act on: a
 * wrong password, no private key, or no certificate for the key.
 */
export function readPkcs12(p12: Buffer, password: string): Pkcs12Contents {
  let pfx: forge.pkcs12.Pkcs12Pfx;
  try {
    const der = asn1.fromDer(p12.toString("binary"));
    pfx = forge.pkcs12.pkcs12FromAsn1(der, false, password);
  } catch (error) {
    throw new Error(
      `The PKCS#12 file could not be opened (wrong password, or not a PKCS#12 file): ${messageOf(error)}`,
    );
  }
  const privateKey = firstPrivateKey(pfx);
  const certificates = bagsOf(pfx, pki.oids.certBag)
    .map((bag) => bag.cert)
    .filter((cert): cert is forge.pki.Certificate => Boolean(cert));
  const signerCertificate = certificates.find((cert) =>
    matchesKey(cert, privateKey),
  );
  if (!signerCertificate)
    throw new Error(
      "The PKCS#12 file holds no certificate for its private key.",
    );
  return {
    privateKey,
    signerCertificate,
    chain: certificates.filter((cert) => cert !== signerCertificate),
  };
}

function firstPrivateKey(
  pfx: forge.pkcs12.Pkcs12Pfx,
): forge.pki.rsa.PrivateKey {
  const bags = [
    ...bagsOf(pfx, pki.oids.pkcs8ShroudedKeyBag),
    ...bagsOf(pfx, pki.oids.keyBag),
  ];
  const key = bags.find((bag) => bag.key)?.key;
  if (!key)
    throw new Error(
      "The PKCS#12 file holds no RSA private key (Joulebook signs with RSA).",
    );
  return key as forge.pki.rsa.PrivateKey;
}

function bagsOf(
  pfx: forge.pkcs12.Pkcs12Pfx,
  bagType: string,
): forge.pkcs12.Bag[] {
  return pfx.getBags({ bagType })[bagType] ?? [];
}

function matchesKey(
  cert: forge.pki.Certificate,
  key: forge.pki.rsa.PrivateKey,
): boolean {
  const publicKey = cert.publicKey as Partial<forge.pki.rsa.PublicKey>;
  return Boolean(
    publicKey.n &&
    publicKey.e &&
    publicKey.n.compareTo(key.n) === 0 &&
    publicKey.e.compareTo(key.e) === 0,
  );
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
