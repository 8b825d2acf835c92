import forge from 'node-forge';
import { Signer } from '@signpdf/signpdf';
import { forgePrivate } from './personal-certificate.js';
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
    key: forgePrivate(identity.privateKey),
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
