import { readFileSync, statSync, writeFileSync, openSync, closeSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { KeyObject } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { certificateFacts } from '../../src-main/services/signing/certificate-facts.js';
import { keyIterations } from '../../src-main/services/signing/encrypted-pkcs8.js';
import { writeOwnerOnly } from '../../src-main/services/signing/key-file.js';
import { openSigningIdentity } from '../../src-main/services/signing/key-source.js';
import { readPassphrase } from '../../src-main/services/signing/passphrase.js';
import {
  createPersonalIdentity,
  exportPkcs12,
  personalKeyFileText,
  openPersonalKeyFile,
  readPersonalKeyFile,
} from '../../src-main/services/signing/personal-certificate.js';
import { readPkcs12 } from '../../src-main/services/signing/pkcs12-identity.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';
import { makeP12, openssl, scratchFolder, type OpensslP12 } from './signing-fixtures.js';

const folder = scratchFolder('keys');
let rsa: OpensslP12;
let personal: SigningIdentity;
let keyText: string;
const passphrase = 'correct horse battery staple';

beforeAll(async () => {
  rsa = makeP12(folder, 'company', 'rsa', 'Dana Okafor');
  personal = await createPersonalIdentity({ name: 'Rui Tanaka', organization: 'Invented Gasket Plant' });
  keyText = await personalKeyFileText(personal, passphrase);
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('PKCS#12 files as companies issue them', () => {
  it('reads the RSA key and certificate; the fingerprint matches OpenSSL’s SHA-256 fingerprint', () => {
    const identity = readPkcs12(readFileSync(rsa.path), rsa.passphrase, 'company.p12');
    const opensslFingerprint = openssl([
      'x509',
      '-in',
      rsa.certificatePath,
      '-noout',
      '-fingerprint',
      '-sha256',
    ])
      .split('=')[1]!
      .trim()
      .replaceAll(':', '')
      .toLowerCase();
    expect(identity.facts.fingerprint).toBe(opensslFingerprint);
    expect(identity.facts.commonName).toBe('Dana Okafor');
    expect(identity.privateKey.asymmetricKeyType).toBe('rsa');
    // openssl req -x509 issues a self-signed certificate: subject = issuer.
    expect(identity.facts.selfIssued).toBe(true);
  });

  it('refuses a wrong passphrase with a message that names the file', () => {
    expect(() => readPkcs12(readFileSync(rsa.path), 'wrong', 'company.p12')).toThrow(
      /company\.p12: the passphrase does not open/,
    );
  });

  it('refuses an EC key with a clear message', () => {
    const ec = makeP12(folder, 'ec', 'ec', 'Elliptic Tester');
    expect(() => readPkcs12(readFileSync(ec.path), ec.passphrase, 'ec.p12')).toThrow(
      /ec\.p12: holds an elliptic-curve \(EC\) key; Limit Ledger signs with RSA keys only/,
    );
  });

  it('refuses a file that is not PKCS#12', () => {
    expect(() => readPkcs12(Buffer.from('not a key'), 'x', 'notes.p12')).toThrow(
      /notes\.p12: not a readable PKCS#12/,
    );
  });
});

describe('personal signing certificates', () => {
  it('are RSA 3072 and self-issued', () => {
    expect(personal.privateKey.asymmetricKeyDetails?.modulusLength).toBe(3072);
    expect(personal.facts.selfIssued).toBe(true);
    expect(personal.facts.commonName).toBe('Rui Tanaka');
    const text = openssl(['x509', '-inform', 'DER', '-noout', '-text'], personal.certificate);
    expect(text).toMatch(/Public-Key: \(3072 bit\)/);
    expect(text).toMatch(/Signature Algorithm: sha256WithRSAEncryption/);
    expect(text).toMatch(/Digital Signature, Non Repudiation/);
  });

  it('are stored as PBES2 / PBKDF2-HMAC-SHA256 600,000 iterations / AES-256-CBC, as OpenSSL reads it', () => {
    expect(keyText).not.toMatch(/BEGIN (RSA )?PRIVATE KEY/);
    const parsed = openssl(['asn1parse'], keyText);
    expect(parsed).toMatch(/:PBES2/);
    expect(parsed).toMatch(/:PBKDF2/);
    expect(parsed).toMatch(/INTEGER\s+:0927C0/); // 600,000 = 0x927C0
    expect(parsed).toMatch(/:hmacWithSHA256/);
    expect(parsed).toMatch(/:aes-256-cbc/);
    expect(keyIterations).toBe(600_000);
    const passFile = join(folder, 'personal.pass');
    writeFileSync(passFile, passphrase);
    const decrypted = openssl(['pkey', '-passin', `file:${passFile}`, '-noout', '-text'], keyText);
    expect(decrypted).toMatch(/Private-Key: \(3072 bit/);
  });

  it('round-trip through the key file, and a wrong passphrase is refused', () => {
    const back = readPersonalKeyFile(keyText, passphrase, 'me.key');
    expect(back.facts.fingerprint).toBe(personal.facts.fingerprint);
    expect(() => readPersonalKeyFile(keyText, 'nope', 'me.key')).toThrow(
      /me\.key: the passphrase does not open/,
    );
  });

  it('opens the key file off the main thread to the same key, and refuses a wrong passphrase there too', async () => {
    const back = await openPersonalKeyFile(keyText, passphrase, 'me.key');
    expect(back.facts.fingerprint).toBe(personal.facts.fingerprint);
    const der = (key: KeyObject) => key.export({ type: 'pkcs8', format: 'der' });
    expect(der(back.privateKey).equals(der(personal.privateKey))).toBe(true);
    await expect(openPersonalKeyFile(keyText, 'nope', 'me.key')).rejects.toThrow(
      /me\.key: the passphrase does not open/,
    );
  });

  it('refuse an unencrypted key file', () => {
    const plain = personal.privateKey.export({ type: 'pkcs8', format: 'pem' }) as string;
    expect(() => readPersonalKeyFile(plain, passphrase, 'plain.pem')).toThrow(/stored unencrypted/);
  });

  it('are written with mode 0600 and opened by content', async () => {
    const path = join(folder, 'rui.key');
    await writeOwnerOnly(path, keyText);
    expect(statSync(path).mode & 0o777).toBe(0o600);
    const opened = await openSigningIdentity(path, passphrase);
    expect(opened.facts.fingerprint).toBe(personal.facts.fingerprint);
    const company = await openSigningIdentity(rsa.path, rsa.passphrase);
    expect(company.facts.commonName).toBe('Dana Okafor');
  });

  it('export as PKCS#12 that OpenSSL opens, with the key under 600,000 PBKDF2 iterations', async () => {
    const p12 = await exportPkcs12(personal, passphrase);
    const path = join(folder, 'rui.p12');
    writeFileSync(path, p12);
    const passFile = join(folder, 'p12.pass');
    writeFileSync(passFile, passphrase);
    const info = openssl(['pkcs12', '-in', path, '-passin', `file:${passFile}`, '-info', '-noout'], '');
    expect(info).toMatch(/MAC: sha256/);
    expect(info).toMatch(/PBES2, PBKDF2, AES-256-CBC, Iteration 600000, PRF hmacWithSHA256/);
    const certificate = openssl([
      'pkcs12',
      '-in',
      path,
      '-passin',
      `file:${passFile}`,
      '-nokeys',
      '-clcerts',
    ]);
    const der = Buffer.from(
      certificate.split('-----BEGIN CERTIFICATE-----')[1]!.split('-----END')[0]!.replace(/\s/g, ''),
      'base64',
    );
    expect(certificateFacts(der).fingerprint).toBe(personal.facts.fingerprint);
  });
});

describe('passphrases', () => {
  it('come from an environment variable, and an empty one is refused', async () => {
    expect(await readPassphrase({ kind: 'env', variable: 'LL_PASS' }, { LL_PASS: 'abc' })).toBe('abc');
    await expect(readPassphrase({ kind: 'env', variable: 'LL_PASS' }, {})).rejects.toThrow(
      /LL_PASS holds no passphrase/,
    );
  });

  it('come from a file descriptor, without the final newline', async () => {
    const path = join(folder, 'fd.pass');
    writeFileSync(path, 'from a descriptor\n');
    const fd = openSync(path, 'r');
    try {
      expect(await readPassphrase({ kind: 'fd', fd })).toBe('from a descriptor');
    } finally {
      closeSync(fd);
    }
  });
});
