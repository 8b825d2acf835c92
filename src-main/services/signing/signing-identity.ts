import type { KeyObject } from 'node:crypto';
import type { CertificateFacts } from './certificate-facts.js';

/**
 * A private key and the certificate that names its holder, held in memory only while signing.
 * The key is a KeyObject so that it is never turned into text by accident (logging a KeyObject
 * prints no key material); it is never serialized to the renderer.
 */
export interface SigningIdentity {
  privateKey: KeyObject;
  /** DER of the signer's certificate. */
  certificate: Buffer;
  /** DER of the further certificates that came with it (issuers), in file order. */
  chain: Buffer[];
  facts: CertificateFacts;
}

/** Why a key could not be used; never contains key material or the passphrase. */
export class KeyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'KeyError';
  }
}
