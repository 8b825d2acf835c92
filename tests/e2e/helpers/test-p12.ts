import { execFileSync } from 'node:child_process';
import { join } from 'node:path';

/**
 * A throwaway RSA 3072 signer for one test, made by OpenSSL in `folder` (removed with it): a PKCS#12
 * file with passphrase "test-pass", in the legacy encryption other software still writes.
 */
export function makeTestP12(folder: string, name: string, commonName: string): string {
  const key = join(folder, `${name}.pem`);
  const cert = join(folder, `${name}.crt`);
  const p12 = join(folder, `${name}.p12`);
  execFileSync(
    'openssl',
    [
      'req',
      '-x509',
      '-newkey',
      'rsa:3072',
      '-nodes',
      '-keyout',
      key,
      '-out',
      cert,
      '-subj',
      `/CN=${commonName}`,
      '-days',
      '2',
    ],
    { stdio: 'ignore' },
  );
  execFileSync(
    'openssl',
    [
      'pkcs12',
      '-export',
      '-inkey',
      key,
      '-in',
      cert,
      '-out',
      p12,
      '-passout',
      'pass:test-pass',
      '-keypbe',
      'PBE-SHA1-3DES',
      '-certpbe',
      'PBE-SHA1-3DES',
      '-macalg',
      'sha1',
    ],
    { stdio: 'ignore' },
  );
  return p12;
}
