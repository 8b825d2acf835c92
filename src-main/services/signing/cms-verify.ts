import { createHash, createPublicKey, verify as verifySignature, X509Certificate } from 'node:crypto';
import { certificateFacts, type CertificateFacts } from './certificate-facts.js';
import { children, content, oidText, raw, readTlv, type Tlv } from './der-reader.js';

export interface CmsCheck {
  /** The digest and the signature both hold over the given content. */
  valid: boolean;
  problems: string[];
  signer: CertificateFacts | null;
  /** DER of the signer's certificate, for trust decisions. */
  signerCertificate: Buffer | null;
  certificates: Buffer[];
  signingTime: string | null;
}

const oid = {
  signedData: '1.2.840.113549.1.7.2',
  data: '1.2.840.113549.1.7.1',
  contentType: '1.2.840.113549.1.9.3',
  messageDigest: '1.2.840.113549.1.9.4',
  signingTime: '1.2.840.113549.1.9.5',
  rsaEncryption: '1.2.840.113549.1.1.1',
  sha256WithRsa: '1.2.840.113549.1.1.11',
  sha384WithRsa: '1.2.840.113549.1.1.12',
  sha512WithRsa: '1.2.840.113549.1.1.13',
};
const digests: Record<string, string> = {
  '2.16.840.1.101.3.4.2.1': 'sha256',
  '2.16.840.1.101.3.4.2.2': 'sha384',
  '2.16.840.1.101.3.4.2.3': 'sha512',
};

/**
 * Checks a detached CMS SignedData (RFC 5652 §5) over `signed`: the message-digest attribute must
 * equal the digest of the content, and the signer's RSA signature must verify over the DER of the
 * signed attributes re-tagged as a SET (§5.4). Says nothing about trust in the certificate.
 */
export function verifyDetachedCms(cms: Uint8Array, signed: Uint8Array): CmsCheck {
  const result: CmsCheck = {
    valid: false,
    problems: [],
    signer: null,
    signerCertificate: null,
    certificates: [],
    signingTime: null,
  };
  try {
    const top = readTlv(cms, 0);
    const [typeOid, explicit] = children(cms, top);
    if (!typeOid || oidText(cms, typeOid) !== oid.signedData || !explicit) {
      result.problems.push('the signature is not a CMS SignedData');
      return result;
    }
    const signedData = children(cms, explicit)[0]!;
    const parts = children(cms, signedData);
    const encapsulated = parts[2]!;
    if (children(cms, encapsulated).length > 1) result.problems.push('the signature is not detached');
    const certificateSet = parts.find((part) => part.tag === 0xa0);
    result.certificates = certificateSet
      ? children(cms, certificateSet).map((tlv) => Buffer.from(raw(cms, tlv)))
      : [];
    const signerInfos = parts[parts.length - 1]!;
    const infos = children(cms, signerInfos);
    if (infos.length !== 1) {
      result.problems.push(`the signature holds ${infos.length} signers; one is expected`);
      return result;
    }
    checkSignerInfo(cms, infos[0]!, signed, result);
  } catch (error) {
    result.problems.push(
      `the signature cannot be read (${error instanceof Error ? error.message : String(error)})`,
    );
  }
  result.valid = result.problems.length === 0;
  return result;
}

function checkSignerInfo(cms: Uint8Array, info: Tlv, signed: Uint8Array, result: CmsCheck): void {
  const fields = children(cms, info);
  const sid = fields[1]!;
  const digestAlgorithm = oidText(cms, children(cms, fields[2]!)[0]!);
  const attributes = fields[3]!.tag === 0xa0 ? fields[3]! : undefined;
  const rest = fields.slice(attributes ? 4 : 3);
  const signatureAlgorithm = oidText(cms, children(cms, rest[0]!)[0]!);
  const signature = content(cms, rest[1]!);
  const hash = digests[digestAlgorithm];
  if (!hash) {
    result.problems.push(`unsupported digest algorithm ${digestAlgorithm}`);
    return;
  }
  if (
    ![oid.rsaEncryption, oid.sha256WithRsa, oid.sha384WithRsa, oid.sha512WithRsa].includes(signatureAlgorithm)
  ) {
    result.problems.push(`unsupported signature algorithm ${signatureAlgorithm}`);
    return;
  }
  const signerDer = findSigner(cms, sid, result.certificates);
  if (!signerDer) {
    result.problems.push('the signer’s certificate is not in the signature');
    return;
  }
  result.signerCertificate = signerDer;
  result.signer = certificateFacts(signerDer);
  if (!attributes) {
    result.problems.push('the signature has no signed attributes');
    return;
  }
  const values = new Map<string, Tlv>();
  for (const attribute of children(cms, attributes)) {
    const [type, set] = children(cms, attribute);
    values.set(oidText(cms, type!), children(cms, set!)[0]!);
  }
  const contentType = values.get(oid.contentType);
  if (!contentType || oidText(cms, contentType) !== oid.data)
    result.problems.push('the signed content type is not data');
  const time = values.get(oid.signingTime);
  if (time) result.signingTime = asn1Time(Buffer.from(content(cms, time)).toString('latin1'), time.tag);
  const digest = values.get(oid.messageDigest);
  const actual = createHash(hash).update(signed).digest();
  if (!digest || !actual.equals(content(cms, digest))) {
    result.problems.push('the signed bytes have changed since signing (digest mismatch)');
  }
  // §5.4: the signature covers the DER of the attributes with the SET OF tag, not the [0] tag.
  const attributeBytes = Buffer.from(raw(cms, attributes));
  attributeBytes[0] = 0x31;
  const publicKey = createPublicKey(
    new X509Certificate(signerDer).publicKey.export({ type: 'spki', format: 'pem' }),
  );
  if (!verifySignature(hash, attributeBytes, publicKey, signature)) {
    result.problems.push('the signature does not verify with the signer’s certificate');
  }
}

/** IssuerAndSerialNumber or [0] SubjectKeyIdentifier (RFC 5652 §5.3). */
function findSigner(cms: Uint8Array, sid: Tlv, certificates: Buffer[]): Buffer | undefined {
  if (sid.tag === 0x30) {
    const [issuer, serial] = children(cms, sid);
    const wantIssuer = Buffer.from(raw(cms, issuer!));
    const wantSerial = Buffer.from(raw(cms, serial!));
    return certificates.find((der) => {
      const tbs = children(der, children(der, readTlv(der, 0))[0]!);
      const offset = tbs[0]!.tag === 0xa0 ? 1 : 0;
      return (
        Buffer.from(raw(der, tbs[offset]!)).equals(wantSerial) &&
        Buffer.from(raw(der, tbs[offset + 2]!)).equals(wantIssuer)
      );
    });
  }
  return undefined;
}

function asn1Time(text: string, tag: number): string | null {
  // UTCTime YYMMDDHHMMSSZ (RFC 5280 §4.1.2.5.1: YY < 50 is 20YY) or GeneralizedTime YYYYMMDDHHMMSSZ.
  const full = tag === 0x17 ? (Number(text.slice(0, 2)) < 50 ? '20' : '19') + text : text;
  const match = /^(\d{4})(\d{2})(\d{2})(\d{2})(\d{2})(\d{2})Z$/.exec(full);
  return match ? `${match[1]}-${match[2]}-${match[3]}T${match[4]}:${match[5]}:${match[6]}Z` : null;
}
