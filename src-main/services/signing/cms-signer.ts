import { constants, createHash, privateEncrypt } from 'node:crypto';
import forge from 'node-forge';
import { Signer } from '@signpdf/signpdf';
import type { SigningIdentity } from './signing-identity.js';

/**
 * A detached CMS SignedData (RFC 5652) with SHA-256 and RSA over what @signpdf hands it (the
 * PDF's ByteRange content), carrying the signer's certificate and any issuer certificates.
 * Signed attributes in the order content type, signing time, message digest, as PDF readers
 * expect for adbe.pkcs7.detached.
 */
export class IdentitySigner extends Signer {
  constructor(private readonly identity: SigningIdentity) {
    super();
  }

  override async sign(content: Buffer, signingTime?: Date): Promise<Buffer> {
    return detachedSignature(content, this.identity, signingTime ?? new Date());
  }
}

const { asn1 } = forge;
const { Class, Type } = asn1;
type Asn1 = forge.asn1.Asn1;
const oids = forge.pki.oids as Record<string, string>;
const universal = (type: number, value: string | Asn1[]) =>
  asn1.create(Class.UNIVERSAL, type, Array.isArray(value), value);
const oid = (id: string) => universal(Type.OID, asn1.oidToDer(id).getBytes());
const binary = (bytes: Uint8Array) => Buffer.from(bytes).toString('binary');
const algorithm = (id: string) => universal(Type.SEQUENCE, [oid(id), universal(Type.NULL, '')]);

/** RFC 2985: signing times from 1950 to 2049 are UTCTime, others GeneralizedTime. */
function signingTimeValue(time: Date): Asn1 {
  const year = time.getUTCFullYear();
  return year >= 1950 && year < 2050
    ? universal(Type.UTCTIME, asn1.dateToUtcTime(time))
    : universal(Type.GENERALIZEDTIME, asn1.dateToGeneralizedTime(time));
}

const attribute = (type: string, value: Asn1) =>
  universal(Type.SEQUENCE, [oid(type), universal(Type.SET, [value])]);

/**
 * The SignedData, built field by field as RFC 5652 §5 lays it out (and as node-forge's PKCS#7
 * writer builds it: tests/unit/signing-cms.test.ts compares the bytes). The content's digest is
 * Node's SHA-256, over the content as it is; the signer is named by the issuer and serial number
 * exactly as they stand in its certificate, and the certificates are carried as they were issued.
 */
export function detachedSignature(content: Uint8Array, identity: SigningIdentity, signingTime: Date): Buffer {
  const certificates = [identity.certificate, ...identity.chain].map((der) => asn1.fromDer(binary(der)));
  // TBSCertificate (RFC 5280 §4.1): an explicit [0] version, if present, then serial number,
  // signature algorithm and issuer.
  const tbs = (certificates[0]!.value as Asn1[])[0]!.value as Asn1[];
  const at = tbs[0]!.tagClass === Class.CONTEXT_SPECIFIC ? 1 : 0;
  const [serialNumber, issuer] = [tbs[at]!, tbs[at + 2]!];
  const attributes = [
    attribute(oids.contentType!, oid(oids.data!)),
    attribute(oids.signingTime!, signingTimeValue(signingTime)),
    attribute(
      oids.messageDigest!,
      universal(Type.OCTETSTRING, binary(createHash('sha256').update(content).digest())),
    ),
  ];
  // The signature covers the attributes encoded as a SET OF (RFC 5652 §5.4), stored as [0] IMPLICIT.
  const signedAttributes = Buffer.from(asn1.toDer(universal(Type.SET, attributes)).getBytes(), 'binary');
  const signature = rsaSignSha256(identity, createHash('sha256').update(signedAttributes).digest());
  const signerInfo = universal(Type.SEQUENCE, [
    universal(Type.INTEGER, asn1.integerToDer(1).getBytes()),
    universal(Type.SEQUENCE, [issuer, serialNumber]),
    algorithm(oids.sha256!),
    asn1.create(Class.CONTEXT_SPECIFIC, 0, true, attributes),
    algorithm(oids.rsaEncryption!),
    universal(Type.OCTETSTRING, binary(signature)),
  ]);
  const signedData = universal(Type.SEQUENCE, [
    universal(Type.INTEGER, asn1.integerToDer(1).getBytes()),
    universal(Type.SET, [algorithm(oids.sha256!)]),
    universal(Type.SEQUENCE, [oid(oids.data!)]), // detached: no content
    asn1.create(Class.CONTEXT_SPECIFIC, 0, true, certificates),
    universal(Type.SET, [signerInfo]),
  ]);
  const contentInfo = universal(Type.SEQUENCE, [
    oid(oids.signedData!),
    asn1.create(Class.CONTEXT_SPECIFIC, 0, true, [signedData]),
  ]);
  return Buffer.from(asn1.toDer(contentInfo).getBytes(), 'binary');
}

/** DER prefix of a SHA-256 DigestInfo (RFC 8017 §9.2, note 1). */
const sha256DigestInfo = Buffer.from('3031300d060960864801650304020105000420', 'hex');

/** RSASSA-PKCS1-v1_5 with SHA-256 by node:crypto: native, and the key never leaves its KeyObject. */
function rsaSignSha256(identity: SigningIdentity, digest: Buffer): Buffer {
  return privateEncrypt(
    { key: identity.privateKey, padding: constants.RSA_PKCS1_PADDING },
    Buffer.concat([sha256DigestInfo, digest]),
  );
}
