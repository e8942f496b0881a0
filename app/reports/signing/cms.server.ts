/**
 * Reads the PKCS#7 / CMS SignedData blob of a detached PDF signature
 * (RFC 5652 §5), strictly: every field that no signature covers must hold the
 * one value a well-formed detached signature can have, and the blob must be
 * canonical DER followed only by zero padding. So no byte of an accepted file
 * can change without the check failing, even where the PDF format itself
 * would not notice (the padding, the case of a hex digit, a version number).
 *
 * Parsing is node-forge's DER reader (`parseAllBytes: false`, because the
 * placeholder is longer than the blob); certificates go to node:crypto.
 */
import { X509Certificate } from "node:crypto";
import forge from "node-forge";

const { asn1 } = forge;
type Node = forge.asn1.Asn1;
const UNIVERSAL = asn1.Class.UNIVERSAL;
const CONTEXT = asn1.Class.CONTEXT_SPECIFIC;
const T = asn1.Type;

const OID = {
  signedData: "1.2.840.113549.1.7.2",
  data: "1.2.840.113549.1.7.1",
  contentType: "1.2.840.113549.1.9.3",
  messageDigest: "1.2.840.113549.1.9.4",
  signingTime: "1.2.840.113549.1.9.5",
  rsaEncryption: "1.2.840.113549.1.1.1",
} as const;

const DIGESTS = {
  "2.16.840.1.101.3.4.2.1": {
    name: "sha256",
    bytes: 32,
    rsa: "1.2.840.113549.1.1.11",
  },
  "2.16.840.1.101.3.4.2.2": {
    name: "sha384",
    bytes: 48,
    rsa: "1.2.840.113549.1.1.12",
  },
  "2.16.840.1.101.3.4.2.3": {
    name: "sha512",
    bytes: 64,
    rsa: "1.2.840.113549.1.1.13",
  },
} as const;

export type DigestName = (typeof DIGESTS)[keyof typeof DIGESTS]["name"];

export interface DetachedCms {
  digestAlgorithm: DigestName;
  /** The messageDigest signed attribute: the digest of the signed bytes. */
  messageDigest: Buffer;
  signingTime: Date | null;
  /** The signed attributes re-tagged as SET OF: the bytes the signature is over. */
  signedAttributes: Buffer;
  signature: Buffer;
  signer: X509Certificate;
  certificates: X509Certificate[];
}

/** The blob is not a detached signature this check can read. */
export class MalformedCms extends Error {}

export function readDetachedCms(blob: Buffer): DetachedCms {
  const root = parseCanonical(blob);
  expect(root, UNIVERSAL, T.SEQUENCE, "ContentInfo");
  const [typeNode, wrapped] = exactly(root, 2, "ContentInfo");
  if (oidOf(typeNode, "ContentInfo type") !== OID.signedData)
    throw new MalformedCms("the signature block is not CMS SignedData");
  expect(wrapped, CONTEXT, 0, "the [0] SignedData wrapper");
  const [signedData] = exactly(wrapped, 1, "the [0] SignedData wrapper");
  return readSignedData(signedData);
}

function parseCanonical(blob: Buffer): Node {
  const fromDer = asn1.fromDer as unknown as (
    bytes: string,
    options: { parseAllBytes: boolean; decodeBitStrings: boolean },
  ) => Node;
  const root = fromDer(blob.toString("binary"), {
    parseAllBytes: false,
    decodeBitStrings: false,
  });
  const der = Buffer.from(asn1.toDer(root).getBytes(), "binary");
  if (!blob.subarray(0, der.length).equals(der))
    throw new MalformedCms("the signature block is not canonical DER");
  if (blob.subarray(der.length).some((byte) => byte !== 0))
    throw new MalformedCms(
      "the space after the signature block holds bytes other than zero padding",
    );
  return root;
}

function readSignedData(node: Node): DetachedCms {
  const parts = children(
    expect(node, UNIVERSAL, T.SEQUENCE, "SignedData"),
    "SignedData",
  );
  const [version, digestAlgorithms, encap] = parts;
  expectInteger(version, 1, "SignedData version");
  const certsNode = parts.length === 5 ? parts[3] : undefined;
  if (
    parts.length !== 5 ||
    certsNode?.tagClass !== CONTEXT ||
    certsNode.type !== 0
  )
    throw new MalformedCms(
      "SignedData must hold version, digest algorithms, content info, certificates and signer infos, and nothing else",
    );
  readEncapsulatedContent(encap);
  const certificates = children(certsNode, "certificates").map(readCertificate);
  expect(parts[4], UNIVERSAL, T.SET, "SignerInfos");
  const [signerInfo] = exactly(parts[4], 1, "SignerInfos (one signer)");
  const signer = readSignerInfo(signerInfo, certificates);
  expect(digestAlgorithms, UNIVERSAL, T.SET, "SignedData digest algorithms");
  const [onlyDigest] = exactly(
    digestAlgorithms,
    1,
    "SignedData digest algorithms",
  );
  if (!derOf(onlyDigest).equals(signer.digestAlgorithmDer))
    throw new MalformedCms(
      "SignedData lists a digest algorithm its signer does not use",
    );
  return {
    ...signer.cms,
    certificates: certificates.map((c) => c.x509),
  };
}

function readEncapsulatedContent(node: Node): void {
  const [type, ...content] = children(
    expect(node, UNIVERSAL, T.SEQUENCE, "content info"),
    "content info",
  );
  if (oidOf(type, "content type") !== OID.data || content.length > 0)
    throw new MalformedCms(
      "the signature is not detached (it must sign external data and carry none)",
    );
}

interface EmbeddedCertificate {
  x509: X509Certificate;
  issuerDer: Buffer;
  serialDer: Buffer;
}

function readCertificate(node: Node): EmbeddedCertificate {
  const der = derOf(expect(node, UNIVERSAL, T.SEQUENCE, "certificate"));
  const [tbs] = children(node, "certificate");
  const fields = children(
    expect(tbs, UNIVERSAL, T.SEQUENCE, "TBSCertificate"),
    "TBSCertificate",
  );
  // The version is an optional [0] before the serial number (RFC 5280 §4.1).
  const offset = fields[0]?.tagClass === CONTEXT ? 1 : 0;
  let x509: X509Certificate;
  try {
    x509 = new X509Certificate(der);
  } catch {
    throw new MalformedCms("an embedded certificate cannot be read");
  }
  return {
    x509,
    serialDer: derOf(
      expect(fields[offset], UNIVERSAL, T.INTEGER, "certificate serial"),
    ),
    issuerDer: derOf(
      expect(fields[offset + 2], UNIVERSAL, T.SEQUENCE, "certificate issuer"),
    ),
  };
}

function readSignerInfo(node: Node, certificates: EmbeddedCertificate[]) {
  const parts = children(
    expect(node, UNIVERSAL, T.SEQUENCE, "SignerInfo"),
    "SignerInfo",
  );
  if (parts.length !== 6)
    throw new MalformedCms(
      "the SignerInfo must hold exactly version, signer id, digest algorithm, signed attributes, signature algorithm and signature (no unsigned attributes)",
    );
  const [version, sid, digestAlg, attrs, signatureAlg, signature] = parts;
  expectInteger(version, 1, "SignerInfo version");
  const digest = readDigestAlgorithm(digestAlg);
  readSignatureAlgorithm(signatureAlg, digest.rsa);
  expect(attrs, CONTEXT, 0, "signed attributes");
  const attributes = readSignedAttributes(
    children(attrs, "signed attributes"),
    digest.bytes,
  );
  return {
    digestAlgorithmDer: derOf(digestAlg),
    cms: {
      digestAlgorithm: digest.name,
      ...attributes,
      // RFC 5652 §5.4: the signature is over the DER of the attributes with
      // the [0] IMPLICIT tag replaced by the SET OF tag.
      signedAttributes: derOf(
        asn1.create(
          UNIVERSAL,
          T.SET,
          true,
          children(attrs, "signed attributes"),
        ),
      ),
      signature: Buffer.from(
        primitive(
          expect(signature, UNIVERSAL, T.OCTETSTRING, "signature value"),
        ),
        "binary",
      ),
      signer: findSigner(sid, certificates),
    },
  };
}

function readDigestAlgorithm(node: Node) {
  const oid = algorithmOid(node, "digest algorithm");
  const digest = DIGESTS[oid as keyof typeof DIGESTS];
  if (!digest)
    throw new MalformedCms(
      `the digest algorithm ${oid} is not SHA-256, SHA-384 or SHA-512`,
    );
  return digest;
}

function readSignatureAlgorithm(node: Node, matchingRsaOid: string): void {
  const oid = algorithmOid(node, "signature algorithm");
  if (oid !== OID.rsaEncryption && oid !== matchingRsaOid)
    throw new MalformedCms(
      `the signature algorithm ${oid} is not RSA with the signer's digest`,
    );
}

/** An AlgorithmIdentifier whose parameters are absent or NULL. */
function algorithmOid(node: Node, what: string): string {
  const [oid, ...params] = children(
    expect(node, UNIVERSAL, T.SEQUENCE, what),
    what,
  );
  const nullParams =
    params.length === 0 ||
    (params.length === 1 &&
      params[0].type === T.NULL &&
      params[0].tagClass === UNIVERSAL &&
      params[0].value === "");
  if (!nullParams)
    throw new MalformedCms(`the ${what} has unexpected parameters`);
  return oidOf(oid, what);
}

function readSignedAttributes(attrs: Node[], digestBytes: number) {
  const seen = new Map<string, Node>();
  for (const attr of attrs) {
    const [type, values] = exactly(
      expect(attr, UNIVERSAL, T.SEQUENCE, "attribute"),
      2,
      "attribute",
    );
    const oid = oidOf(type, "attribute type");
    const [value] = exactly(
      expect(values, UNIVERSAL, T.SET, "attribute values"),
      1,
      `attribute ${oid}`,
    );
    if (seen.has(oid))
      throw new MalformedCms(`the signed attribute ${oid} appears twice`);
    seen.set(oid, value);
  }
  const contentType = seen.get(OID.contentType);
  if (!contentType || oidOf(contentType, "contentType attribute") !== OID.data)
    throw new MalformedCms(
      "the signed attributes lack the contentType attribute for data",
    );
  const digest = seen.get(OID.messageDigest);
  if (!digest)
    throw new MalformedCms(
      "the signed attributes lack the messageDigest attribute",
    );
  const messageDigest = Buffer.from(
    primitive(expect(digest, UNIVERSAL, T.OCTETSTRING, "messageDigest")),
    "binary",
  );
  if (messageDigest.length !== digestBytes)
    throw new MalformedCms(
      "the messageDigest attribute has the wrong length for its algorithm",
    );
  return { messageDigest, signingTime: readTime(seen.get(OID.signingTime)) };
}

function readTime(node: Node | undefined): Date | null {
  if (!node) return null;
  const value = primitive(node);
  const date =
    node.type === T.UTCTIME
      ? asn1.utcTimeToDate(value)
      : node.type === T.GENERALIZEDTIME
        ? asn1.generalizedTimeToDate(value)
        : null;
  if (!date || Number.isNaN(date.getTime()))
    throw new MalformedCms("the signingTime attribute is not a valid time");
  return date;
}

function findSigner(
  sid: Node,
  certificates: EmbeddedCertificate[],
): X509Certificate {
  const [issuer, serial] = exactly(
    expect(sid, UNIVERSAL, T.SEQUENCE, "signer id"),
    2,
    "signer id",
  );
  const issuerDer = derOf(
    expect(issuer, UNIVERSAL, T.SEQUENCE, "signer issuer"),
  );
  const serialDer = derOf(
    expect(serial, UNIVERSAL, T.INTEGER, "signer serial"),
  );
  const match = certificates.find(
    (c) => c.issuerDer.equals(issuerDer) && c.serialDer.equals(serialDer),
  );
  if (!match)
    throw new MalformedCms(
      "the signer's certificate is not included in the signature",
    );
  return match.x509;
}

// --- small typed accessors over forge's untyped tree ---

function expect(
  node: Node | undefined,
  tagClass: number,
  type: number,
  what: string,
): Node {
  if (!node || node.tagClass !== tagClass || node.type !== type)
    throw new MalformedCms(`${what} is missing or has the wrong type`);
  return node;
}

function children(node: Node, what: string): Node[] {
  if (!node.constructed || !Array.isArray(node.value))
    throw new MalformedCms(`${what} is not a constructed value`);
  return node.value;
}

function exactly(node: Node, count: number, what: string): Node[] {
  const list = children(node, what);
  if (list.length !== count)
    throw new MalformedCms(
      `${what} has ${list.length} parts, expected ${count}`,
    );
  return list;
}

function primitive(node: Node): string {
  if (node.constructed || typeof node.value !== "string")
    throw new MalformedCms("a value that must be primitive is constructed");
  return node.value;
}

function oidOf(node: Node | undefined, what: string): string {
  return asn1.derToOid(primitive(expect(node, UNIVERSAL, T.OID, what)));
}

/** Versions must be the minimal DER integer, so no other encoding slips by. */
function expectInteger(
  node: Node | undefined,
  expected: number,
  what: string,
): void {
  const bytes = primitive(expect(node, UNIVERSAL, T.INTEGER, what));
  if (bytes !== asn1.integerToDer(expected).getBytes())
    throw new MalformedCms(`${what} is not ${expected}`);
}

function derOf(node: Node): Buffer {
  return Buffer.from(asn1.toDer(node).getBytes(), "binary");
}
