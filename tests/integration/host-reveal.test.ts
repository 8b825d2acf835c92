import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHost, type HostParts } from '../../src-main/desktop/host.js';
import { dispatch } from '../../src-main/desktop/host-handlers.js';
import { ipcHandlerTable } from '../../src-main/desktop/ipc-table.js';
import { appOrigin } from '../../src-main/desktop/window-options.js';
import { ipcChannelOf } from '../../shared-core/api.js';
import type { BrowserHost } from '../../src-main/web/browser-host.js';
import { fakeServices, fixtureTaskModule, startTestHost } from './host-helpers.js';

/** "Show in folder" after an export: the host reveals only the path it recorded for that export. */
describe('revealExport on the desktop host', () => {
  let root: string;
  let parts: HostParts;
  const revealed: string[] = [];

  beforeAll(async () => {
    root = await mkdtemp(join(tmpdir(), 'll-host-reveal-'));
    parts = createHost({
      kind: 'electron',
      version: '0.0.0-test',
      picker: {
        chooseFile: async () => null,
        chooseSaveTarget: async () => null,
        listStudies: async () => [],
      },
      services: fakeServices(),
      recoveryFolder: join(root, 'recovery'),
      taskModule: fixtureTaskModule,
      revealFile: (path) => revealed.push(path),
    });
  });
  afterAll(async () => {
    await rm(root, { recursive: true, force: true });
  });

  it('shows the exported packet at the path the host recorded', async () => {
    const path = join(root, 'Invented line packet.pdf');
    await writeFile(path, '%PDF-1.7\n');
    // What the export job's finish step does with the file it wrote.
    const exported = await parts.files.issuePath(path, 'packet', false);
    revealed.length = 0;
    const reply = await dispatch(parts.handlers, 'revealExport', { file: exported.handle });
    expect(reply).toEqual({ ok: true, value: {} });
    expect(revealed).toEqual([path]);
  });

  it('goes through the ipc table like every channel', async () => {
    const path = join(root, 'Invented line workbook.xlsx');
    await writeFile(path, 'PK');
    const exported = await parts.files.issuePath(path, 'packet', false);
    revealed.length = 0;
    const handler = ipcHandlerTable(parts.handlers).get(ipcChannelOf('revealExport'))!;
    expect(await handler(`${appOrigin}/index.html`, { file: exported.handle })).toEqual({
      ok: true,
      value: {},
    });
    expect(revealed).toEqual([path]);
  });

  it('refuses an id the host never issued', async () => {
    revealed.length = 0;
    const reply = await dispatch(parts.handlers, 'revealExport', { file: 'AAAAAAAAAAAAAAAAAAAAAAAA' });
    expect(reply.ok).toBe(false);
    expect(!reply.ok && reply.error.code).toBe('unknown-file');
    expect(revealed).toEqual([]);
  });

  it.each([
    ['a path', { file: '/home/someone/.ssh' }],
    ['a relative path', { file: '../../etc/passwd' }],
    ['a number', { file: 42 }],
    ['no file', {}],
    ['an extra field', { file: 'AAAAAAAAAAAAAAAAAAAAAAAA', path: '/tmp/x' }],
  ])('refuses %s before any handler runs', async (_what, request) => {
    revealed.length = 0;
    const reply = await dispatch(parts.handlers, 'revealExport', request);
    expect(reply.ok).toBe(false);
    expect(!reply.ok && reply.error.code).toBe('bad-request');
    expect(revealed).toEqual([]);
  });

  it('refuses a handle that is not an export: a study or an uploaded key', async () => {
    const studyPath = join(root, 'Invented line.ledger');
    await writeFile(studyPath, '{}');
    const study = await parts.files.issuePath(studyPath, 'study', true);
    const key = parts.files.issueBytes('signer.p12', new Uint8Array([1, 2, 3]), 'key');
    revealed.length = 0;
    for (const handle of [study.handle, key.handle]) {
      const reply = await dispatch(parts.handlers, 'revealExport', { file: handle });
      expect(!reply.ok && reply.error.code).toBe('not-an-export');
    }
    expect(revealed).toEqual([]);
  });
});

describe('revealExport on the web host', () => {
  let host: BrowserHost;
  let root: string;

  beforeAll(async () => {
    ({ host, root } = await startTestHost());
  });
  afterAll(async () => {
    await host.close();
    await rm(root, { recursive: true, force: true });
  });

  it('has no folders to show and says so', async () => {
    const path = join(root, 'download.pdf');
    await writeFile(path, '%PDF-1.7\n');
    const exported = await host.parts.files.issuePath(path, 'packet', false);
    const reply = (await (
      await fetch(`${host.origin}/api/revealExport`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${host.session.token}` },
        body: JSON.stringify({ file: exported.handle }),
      })
    ).json()) as { ok: boolean; error?: { code: string } };
    expect(reply.ok).toBe(false);
    expect(reply.error?.code).toBe('not-available');
  });
});
