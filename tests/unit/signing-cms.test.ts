import { constants, privateEncrypt } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import forge from 'node-forge';
import { beforeAll, describe, expect, it } from 'vitest';
import { detachedSignature } from '../../src-main/services/signing/cms-signer.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import { readPkcs12 } from '../../src-main/services/signing/pkcs12-identity.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';
import { makeP12, openssl, scratchFolder } from './signing-fixtures.js';

/**
 * The detached CMS signature of a packet: the same bytes as node-forge's PKCS#7 writer makes for
 * the same key, content and time (RSA PKCS#1 v1.5 signatures are deterministic), and verified by
 * OpenSSL (`openssl cms -verify`), an implementation independent of both. Keys are made fresh:
 * one by OpenSSL as a company would issue it, one by the application.
 */
const folder = scratchFolder('cms');
const identities: Record<string, SigningIdentity> = {};

beforeAll(async () => {
  const p12 = makeP12(folder, 'issued', 'rsa', 'Invented Signer');
  const issued = readPkcs12(readFileSync(p12.path), p12.passphrase, 'issued.p12');
  identities.issued = issued;
  identities.personal = await createPersonalIdentity({ name: 'Invented Approver' });
}, 60_000);

/** The signature as node-forge's PKCS#7 writer makes it, signing with the same native key. */
function forgeSignature(content: Uint8Array, identity: SigningIdentity, signingTime: Date): Buffer {
  const fromDer = (der: Buffer) => forge.pki.certificateFromAsn1(forge.asn1.fromDer(der.toString('binary')));
  const certificate = fromDer(identity.certificate);
  const p7 = forge.pkcs7.createSignedData();
  p7.content = forge.util.createBuffer(Buffer.from(content).toString('binary'));
  p7.addCertificate(certificate);
  for (const der of identity.chain) p7.addCertificate(fromDer(der));
  const key = {
    sign: (md: forge.md.MessageDigest) =>
      privateEncrypt(
        { key: identity.privateKey, padding: constants.RSA_PKCS1_PADDING },
        Buffer.concat([
          Buffer.from('3031300d060960864801650304020105000420', 'hex'),
          Buffer.from(md.digest().getBytes(), 'binary'),
        ]),
      ).toString('binary'),
  };
  p7.addSigner({
    key: key as unknown as forge.pki.rsa.PrivateKey,
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

function opensslVerifies(signature: Buffer, content: Buffer, name: string): boolean {
  const [signaturePath, contentPath] = [join(folder, `${name}.p7s`), join(folder, `${name}.bin`)];
  writeFileSync(signaturePath, signature);
  writeFileSync(contentPath, content);
  try {
    // -noverify: the certificates are self-issued; the signature itself is what is checked here.
    const args = ['cms', '-verify', '-binary', '-inform', 'DER', '-noverify', '-out', '/dev/null'];
    openssl([...args, '-in', signaturePath, '-content', contentPath]);
    return true;
  } catch {
    return false;
  }
}

describe('the detached CMS signature', () => {
  const content = Buffer.from('%PDF-1.7 invented packet bytes\n'.repeat(4000), 'latin1');
  for (const name of ['issued', 'personal']) {
    for (const time of ['2026-12-01T10:00:00Z', '2051-03-04T05:06:07Z']) {
      it(`matches node-forge's and verifies in OpenSSL (${name} key, signed ${time.slice(0, 4)})`, () => {
        const identity = identities[name]!;
        const signature = detachedSignature(content, identity, new Date(time));
        expect(signature.equals(forgeSignature(content, identity, new Date(time)))).toBe(true);
        expect(opensslVerifies(signature, content, `${name}-${time.slice(0, 4)}`)).toBe(true);
        const changed = Buffer.from(content);
        changed[1000] ^= 1;
        expect(opensslVerifies(signature, changed, `${name}-${time.slice(0, 4)}-changed`)).toBe(false);
      });
    }
  }
});
