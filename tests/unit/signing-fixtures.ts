import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Test keys are made fresh by each test run with OpenSSL (an implementation independent of
 * node-forge), never committed. A missing tool fails loudly: CI installs openssl.
 */
export function openssl(args: string[], input?: Buffer | string): string {
  const run = spawnSync('openssl', args, { input: input ?? '', encoding: 'latin1' });
  if (run.error) throw new Error(`openssl is needed by this test and cannot run: ${run.error.message}`);
  if (run.status !== 0) throw new Error(`openssl ${args[0]} failed (${run.status}): ${run.stderr}`);
  // Some subcommands (pkcs12 -info) report on stderr.
  return run.stdout + run.stderr;
}

export function scratchFolder(prefix: string): string {
  return mkdtempSync(join(tmpdir(), `ll-${prefix}-`));
}

export interface OpensslP12 {
  path: string;
  certificatePath: string;
  passphrase: string;
}

/** A PKCS#12 file as a company CA would issue one (OpenSSL 3 defaults: AES-256, PBKDF2, SHA-256 MAC). */
export function makeP12(folder: string, name: string, keyType: 'rsa' | 'ec', commonName: string): OpensslP12 {
  const key = join(folder, `${name}.key`);
  const certificatePath = join(folder, `${name}.crt`);
  const path = join(folder, `${name}.p12`);
  const passphrase = `test passphrase for ${name}`;
  const keyArgs =
    keyType === 'rsa' ? ['-newkey', 'rsa:3072'] : ['-newkey', 'ec', '-pkeyopt', 'ec_paramgen_curve:P-256'];
  openssl([
    'req',
    '-x509',
    ...keyArgs,
    '-nodes',
    '-keyout',
    key,
    '-out',
    certificatePath,
    '-days',
    '30',
    '-subj',
    `/CN=${commonName}/O=Invented Test Works`,
  ]);
  writeFileSync(join(folder, `${name}.pass`), passphrase);
  openssl([
    'pkcs12',
    '-export',
    '-inkey',
    key,
    '-in',
    certificatePath,
    '-out',
    path,
    '-passout',
    `file:${join(folder, `${name}.pass`)}`,
  ]);
  return { path, certificatePath, passphrase };
}
