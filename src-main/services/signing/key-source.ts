import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { openPersonalKeyFile } from './personal-certificate.js';
import { readPkcs12 } from './pkcs12-identity.js';
import type { SigningIdentity } from './signing-identity.js';

/**
 * Opens the key a user names: a PKCS#12 file (binary DER) or a personal key file (PEM text with an
 * encrypted PKCS#8 key and its certificate), told apart by content rather than by extension.
 */
export async function openSigningIdentity(path: string, passphrase: string): Promise<SigningIdentity> {
  const bytes = await readFile(path);
  const name = basename(path);
  const looksLikePem = bytes.subarray(0, 64).toString('latin1').includes('-----BEGIN');
  return looksLikePem
    ? openPersonalKeyFile(bytes.toString('utf8'), passphrase, name)
    : readPkcs12(bytes, passphrase, name);
}
