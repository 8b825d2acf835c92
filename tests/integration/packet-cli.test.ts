import { spawnSync } from 'node:child_process';
import { closeSync, copyFileSync, openSync, readFileSync, writeFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeP12 } from '../unit/signing-fixtures.js';
import { scratch } from './packet-tools.js';

/**
 * A newcomer's path through the built command (npm test builds first): demo → keys → sign
 * (prepared, approved) → packet → verify → countersign → verify, and the refusals on the way.
 */
const cli = fileURLToPath(new URL('../../bin/limit-ledger.js', import.meta.url));
const folder = scratch('cli');
const env = { ...process.env, LL_RUI: 'rui passphrase 1', LL_DANA: 'dana passphrase 2' };
const limitLedger = (args: string[], stdio: (number | 'pipe' | 'ignore')[] = ['ignore', 'pipe', 'pipe']) => {
  const result = spawnSync(process.execPath, [cli, ...args], { cwd: folder, env, stdio, encoding: 'utf8' });
  return { status: result.status, out: `${result.stdout}${result.stderr}` };
};

beforeAll(() => {
  expect(limitLedger(['demo', '--out', 'demo.ledger']).status).toBe(0);
  expect(
    limitLedger(['sign', '--create-key', 'rui.key', '--signer', 'Rui Tanaka', '--passphrase-env', 'LL_RUI'])
      .status,
  ).toBe(0);
  expect(
    limitLedger([
      'sign',
      '--create-key',
      'dana.key',
      '--signer',
      'Dana Okafor',
      '--passphrase-env',
      'LL_DANA',
    ]).status,
  ).toBe(0);
}, 120_000);

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('limit-ledger sign, packet, verify and countersign', () => {
  it('runs the whole path and verify exits 0', () => {
    const prepared = limitLedger([
      'sign',
      'demo.ledger',
      '--p12',
      'rui.key',
      '--passphrase-env',
      'LL_RUI',
      '--signer',
      'Rui Tanaka',
      '--role',
      'Quality engineer',
      '--meaning',
      'prepared',
      '--effective',
      '2026-12-07',
      '--review',
      '2027-06-07',
      '--reaction-plan',
      'Hold the cart and call the shift lead.',
    ]);
    expect(prepared.out).toMatch(/signed revision 1 of demo.ledger as "prepared"/);
    expect(prepared.status).toBe(0);
    // The passphrase from a file descriptor (3), as a script would pass it.
    const passFile = join(folder, 'dana.pass');
    writeFileSync(passFile, 'dana passphrase 2\n');
    const fd = openSync(passFile, 'r');
    const approved = limitLedger(
      [
        'sign',
        'demo.ledger',
        '--p12',
        'dana.key',
        '--passphrase-fd',
        '3',
        '--signer',
        'Dana Okafor',
        '--role',
        'Quality manager',
        '--meaning',
        'approved',
      ],
      ['ignore', 'pipe', 'pipe', fd],
    );
    closeSync(fd);
    expect(approved.out).toMatch(/approved and frozen/);
    const packet = limitLedger([
      'packet',
      'demo.ledger',
      '--pdf',
      'packet.pdf',
      '--xlsx',
      'packet.xlsx',
      '--p12',
      'dana.key',
      '--passphrase-env',
      'LL_DANA',
      '--paper',
      'letter',
    ]);
    expect(packet.out).toMatch(
      /wrote packet.xlsx, packet.pdf, packet.limits.csv, packet.limits.json, packet.chart.svg/,
    );
    expect(packet.status).toBe(0);
    const verified = limitLedger(['verify', 'packet.pdf', '--workbook', 'packet.xlsx']);
    expect(verified.out).toMatch(/VERIFIED: packet.pdf holds/);
    expect(verified.status).toBe(0);
    const countersigned = limitLedger([
      'countersign',
      'packet.pdf',
      '--p12',
      'rui.key',
      '--passphrase-env',
      'LL_RUI',
      '--out',
      'countersigned.pdf',
    ]);
    expect(countersigned.out).toMatch(/2 signatures/);
    expect(limitLedger(['verify', 'countersigned.pdf', '--workbook', 'packet.xlsx']).status).toBe(0);
  }, 180_000);

  it('exits 1 for a packet changed after signing', () => {
    copyFileSync(join(folder, 'packet.pdf'), join(folder, 'changed.pdf'));
    const bytes = readFileSync(join(folder, 'changed.pdf'));
    bytes[2000] = bytes[2000]! ^ 0x20;
    writeFileSync(join(folder, 'changed.pdf'), bytes);
    const verified = limitLedger(['verify', 'changed.pdf']);
    expect(verified.out).toMatch(/NOT VERIFIED/);
    expect(verified.status).toBe(1);
  }, 180_000);

  it('never takes a passphrase as a command-line value, and refuses EC keys', () => {
    const typed = limitLedger([
      'sign',
      'demo.ledger',
      '--p12',
      'rui.key',
      '--passphrase',
      'rui passphrase 1',
    ]);
    expect(typed.status).toBe(2);
    expect(typed.out).toMatch(/never taken as a command-line value/);
    const ec = makeP12(folder, 'ec', 'ec', 'Elliptic Signer');
    const ecEnv = { ...env, LL_EC: ec.passphrase };
    const result = spawnSync(
      process.execPath,
      [
        cli,
        'sign',
        'demo.ledger',
        '--p12',
        ec.path,
        '--passphrase-env',
        'LL_EC',
        '--signer',
        'E',
        '--role',
        'R',
        '--meaning',
        'reviewed',
      ],
      { cwd: folder, env: ecEnv, encoding: 'utf8' },
    );
    expect(result.status).toBe(2);
    expect(result.stderr).toMatch(/elliptic-curve \(EC\) key; Limit Ledger signs with RSA keys only/);
  }, 180_000);
});
