import { constants, privateEncrypt } from 'node:crypto';
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

export function detachedSignature(content: Uint8Array, identity: SigningIdentity, signingTime: Date): Buffer {
  const fromDer = (der: Buffer) => forge.pki.certificateFromAsn1(forge.asn1.fromDer(der.toString('binary')));
  const certificate = fromDer(identity.certificate);
  const p7 = forge.pkcs7.createSignedData();
  p7.content = forge.util.createBuffer(Buffer.from(content).toString('binary'));
  p7.addCertificate(certificate);
  for (const der of identity.chain) p7.addCertificate(fromDer(der));
  p7.addSigner({
    key: nativeKey(identity) as unknown as forge.pki.rsa.PrivateKey,
    certificate,
    digestAlgorithm: forge.pki.oids.sha256!,
    authenticatedAttributes: [
      { type: forge.pki.oids.contentType!, value: forge.pki.oids.data },
      { type: forge.pki.oids.signingTime!, value: signingTime as unknown as string },
      { type: forge.pki.oids.messageDigest! },
    ],
  });
  p7.sign({ detached: true });
  return Buffer.from(forge.asn1.toDer(p7.toAsn1()).getBytes(), 'binary');
}

/** DER prefix of a SHA-256 DigestInfo (RFC 8017 §9.2, note 1). */
const sha256DigestInfo = Buffer.from('3031300d060960864801650304020105000420', 'hex');

/**
 * node-forge asks its key to sign the digest of the signed attributes; this key answers with
 * node:crypto's RSASSA-PKCS1-v1_5 (native, and the key never leaves its KeyObject).
 */
function nativeKey(identity: SigningIdentity): { sign: (md: forge.md.MessageDigest) => string } {
  return {
    sign: (md) => {
      const digest = Buffer.from(md.digest().getBytes(), 'binary');
      const signature = privateEncrypt(
        { key: identity.privateKey, padding: constants.RSA_PKCS1_PADDING },
        Buffer.concat([sha256DigestInfo, digest]),
      );
      return signature.toString('binary');
    },
  };
}
