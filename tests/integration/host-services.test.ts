import { mkdtemp, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { startBrowserHost, type BrowserHost } from '../../src-main/web/browser-host.js';

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- replies are checked field by field
type Loose = any;

/** The real services behind the channels, reached the way the page reaches them. */
describe('the browser host with its real services', () => {
  let host: BrowserHost;
  let root: string;
  const call = async (channel: string, payload: unknown) => {
    const response = await fetch(`${host.origin}/api/${channel}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${host.session.token}` },
      body: JSON.stringify(payload),
    });
    return (await response.json()) as {
      ok: boolean;
      value?: Loose;
      error?: { code: string; message: string };
    };
  };

  beforeAll(async () => {
    root = await mkdtemp(join(tmpdir(), 'll-host-real-'));
    await mkdir(join(root, 'renderer'));
    await writeFile(join(root, 'renderer', 'index.html'), '<!doctype html>');
    host = await startBrowserHost({
      workspace: join(root, 'ws'),
      dataFolder: join(root, 'data'),
      rendererDir: join(root, 'renderer'),
    });
  });
  afterAll(async () => {
    await host.close();
    await rm(root, { recursive: true, force: true });
  });

  it('imports an uploaded CSV in a worker job and reports every rejected cell', async () => {
    // Invented counts; row 4 carries a fractional count that must be rejected, not dropped.
    const csv = 'lot,defects,panels\nA1,3,2\nA2,2.5,2\nA3,4,2\nA4,1,2\n';
    const uploaded = await call('uploadFile', {
      purpose: 'data',
      fileName: 'counts.csv',
      bytes: Buffer.from(csv).toString('base64'),
    });
    const started = await call('importData', {
      file: uploaded.value.handle,
      mapping: { count: 'defects', units: 'panels', label: 'lot' },
    });
    expect(started.ok).toBe(true);
    const final = await host.parts.jobs.settled(started.value.jobId);
    expect(final?.state).toBe('done');
    const outcome = (final as { result: Loose }).result;
    expect(outcome.ok).toBe(true);
    expect(outcome.value.observations.map((each: { label: string }) => each.label)).toEqual([
      'A1',
      'A3',
      'A4',
    ]);
    expect(outcome.value.rejected).toEqual([
      expect.objectContaining({ row: 3, column: 'defects', value: '2.5' }),
    ]);
    const status = await call('jobStatus', { jobId: started.value.jobId });
    expect(status.value.state).toBe('done');
  });

  it('recomputes on the host with the same core the renderer uses', async () => {
    const observations = [3, 5, 2, 4, 6, 1, 4].map((count, index) => ({
      label: `P${index + 1}`,
      row: index + 2,
      count,
      units: 1,
    }));
    const options = { limits: 'sigma' as const, multiplier: 3, alpha: 0.0027, rules: ['beyond' as const] };
    const reply = await call('analyze', { observations, exclusions: [], options });
    expect(reply.ok).toBe(true);
    expect(reply.value).toEqual(JSON.parse(JSON.stringify(analyzePhaseOne(observations, [], options))));
  });

  it('starts with the default site settings and keeps a saved change', async () => {
    const settings = await call('siteSettings', {});
    expect(settings.value.defaults).toEqual({
      limits: 'sigma',
      multiplier: 3,
      alpha: 0.0027,
      rules: ['beyond'],
    });
    const saved = await call('saveSiteSettings', {
      ...settings.value,
      causeCategories: ['Resin lot', 'Press'],
    });
    expect(saved.ok).toBe(true);
    expect((await call('siteSettings', {})).value.causeCategories).toEqual(['Resin lot', 'Press']);
  });

  it('serves the invented demo study, labelled as invented, with the analysis input lifted out', async () => {
    const demo = await call('demoStudy', {});
    expect(demo.ok).toBe(true);
    expect(demo.value.file).toBeNull();
    expect(demo.value.document.identity.demo).toBe(true);
    expect(demo.value.readOnly).toBe(false);
    expect(demo.value.observations.length).toBeGreaterThan(10);
    const analysis = await call('analyze', {
      observations: demo.value.observations,
      exclusions: demo.value.exclusions,
      options: demo.value.options,
    });
    expect(analysis.value.ok).toBe(true);
    expect(analysis.value.value.periods).toHaveLength(demo.value.observations.length);
  });

  it('saves a study into the workspace, reopens it, keeps a backup and notices a change made elsewhere', async () => {
    const demo = (await call('demoStudy', {})).value;
    const target = (await call('chooseSaveTarget', { purpose: 'study', suggestedName: 'door panels' })).value;
    const first = await call('saveStudy', { target: target.handle, document: demo.document });
    expect(first.value).toMatchObject({
      saved: true,
      file: { fileName: 'door panels.ledger' },
      backupKept: false,
    });
    // The demo was made under the site's settings, and says so; the saved document is handed back.
    expect(demo.document.siteSettings.defaults.limits).toBe('sigma');
    expect(first.value.document).toEqual(demo.document);
    const listed = (await call('listWorkspace', {})).value.files;
    const entry = listed.find((file: { fileName: string }) => file.fileName === 'door panels.ledger');
    const reopened = await call('openStudy', { file: entry.handle });
    expect(reopened.value.ok).toBe(true);
    expect(reopened.value.value.document).toEqual(demo.document);
    expect(reopened.value.value.file.fileName).toBe('door panels.ledger');
    const second = await call('saveStudy', { target: entry.handle, document: demo.document });
    expect(second.value).toMatchObject({ saved: true, backupKept: true });
    // Someone else writes the file: the next save asks instead of overwriting.
    const path = join(root, 'ws', 'door panels.ledger');
    await writeFile(path, (await readFile(path, 'utf8')).replace('"schemaVersion"', ' "schemaVersion"'));
    const third = await call('saveStudy', { target: entry.handle, document: demo.document });
    expect(third.value).toMatchObject({ saved: false, reason: 'changed-on-disk' });
    expect(third.value.message).not.toContain(root);
    const forced = await call('saveStudy', {
      target: entry.handle,
      document: demo.document,
      overwriteChanged: true,
    });
    expect(forced.value.saved).toBe(true);
    expect((await readdir(join(root, 'ws'))).sort()).toEqual([
      'door panels.ledger',
      'door panels.ledger.bak',
    ]);
  });

  it('refuses to save a document that is not a valid study, and opens a broken one with its problems', async () => {
    const target = (await call('chooseSaveTarget', { purpose: 'study', suggestedName: 'broken' })).value;
    const refused = await call('saveStudy', {
      target: target.handle,
      document: { schemaVersion: 1, id: 'x' },
    });
    expect(refused.value).toMatchObject({ saved: false, reason: 'refused' });
    const demo = (await call('demoStudy', {})).value;
    const tampered = structuredClone(demo.document);
    tampered.observations[0].count += 1;
    const bytes = Buffer.from(JSON.stringify(tampered)).toString('base64');
    const uploaded = (await call('uploadFile', { purpose: 'study', fileName: 'tampered.ledger', bytes }))
      .value;
    const opened = await call('openStudy', { file: uploaded.handle });
    expect(opened.value.ok).toBe(true);
    expect(opened.value.value.readOnly).toBe(true);
    expect(opened.value.value.findings.length).toBeGreaterThan(0);
  });

  it('previews a CSV and a workbook for the column mapping, with the sheets of the workbook', async () => {
    const csv = 'Lot;Blemishes;Panels\nA1;3;2\nA2;4;2\n';
    const text = (
      await call('uploadFile', {
        purpose: 'data',
        fileName: 'semi.csv',
        bytes: Buffer.from(csv).toString('base64'),
      })
    ).value;
    const previewed = await call('inspectData', { file: text.handle });
    expect(previewed.value).toEqual({
      ok: true,
      value: {
        file: { handle: text.handle, fileName: 'semi.csv' },
        sheets: [],
        columns: ['Lot', 'Blemishes', 'Panels'],
        preview: [
          ['A1', '3', '2'],
          ['A2', '4', '2'],
        ],
      },
    });
    const workbook = new ExcelJS.Workbook();
    workbook.addWorksheet('Notes').addRow(['invented data']);
    const counts = workbook.addWorksheet('Counts');
    counts.addRow(['shift', 'count']);
    counts.addRow(['S1', 5]);
    const bytes = Buffer.from(await workbook.xlsx.writeBuffer()).toString('base64');
    const book = (await call('uploadFile', { purpose: 'data', fileName: 'book.xlsx', bytes })).value;
    const sheets = await call('inspectData', { file: book.handle });
    expect(sheets.value.ok).toBe(true);
    expect(sheets.value.value.sheets).toEqual(['Notes', 'Counts']);
    const broken = (
      await call('uploadFile', {
        purpose: 'data',
        fileName: 'bad.xlsx',
        bytes: Buffer.from('PK\u0003\u0004garbage').toString('base64'),
      })
    ).value;
    const refused = await call('inspectData', { file: broken.handle });
    expect(refused.value.ok).toBe(false);
    expect(refused.value.findings[0].file).toBe('bad.xlsx');
  });
});
