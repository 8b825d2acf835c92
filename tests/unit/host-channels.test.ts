import { describe, expect, it } from 'vitest';
import { channelNames, channels, HostEvent, type ChannelName } from '../../shared-core/api.js';
import { defaultSiteSettings } from '../../shared-core/settings/site-settings.js';

// One valid request and response per channel (invented values). The Record type makes a new
// channel without samples a compile error, so every channel is covered.
const file = {
  handle: 'h_0123456789abcdef',
  fileName: 'invented line.ledger',
  size: 120,
  modified: '2026-01-05T08:00:00.000Z',
};
const study = {
  file,
  title: 'Invented',
  unitName: 'one panel',
  document: { schemaVersion: 1, nested: { kept: [1, 2] } },
  observations: [{ label: 'W1', row: 2, count: 4, units: 2.5, date: '2026-01-05' }],
  exclusions: [
    { index: 0, cause: { category: 'Material', description: 'wrong resin lot', reference: 'CA-17' } },
  ],
  options: { limits: 'laney', multiplier: 3, alpha: 0.0027, rules: ['beyond', 'run:8'] },
  readOnly: false,
  findings: [{ file: 'x.ledger', row: 3, column: 'count', value: '2.5', message: 'not whole' }],
};
const period = {
  index: 0,
  label: 'W1',
  row: 2,
  count: 4,
  units: 2.5,
  rate: 1.6,
  center: 1.6,
  lcl: null,
  ucl: 4,
  z: 0,
  status: 'in',
  rules: [],
  extraField: 'passes through',
};
const analysis = {
  chart: 'u',
  limits: 'sigma',
  center: 1.6,
  rate: 1.6,
  rateSource: 'estimated',
  rateInterval: { lower: 0.4, upper: 4 },
  rateEffect: { units: 2.5, uclAtLower: 1, uclAtUpper: 6 },
  sigmaZ: null,
  multiplier: 3,
  alpha: null,
  fap: 0.0027,
  m: 1,
  totals: { count: 4, units: 2.5 },
  periods: [period],
  dispersion: { statistic: 0, df: 0, pOver: 1, pUnder: 1, smallExpected: 1, advice: '' },
  averageK: null,
  stable: true,
  warnings: [{ code: 'few-periods', message: 'only one period' }],
};
const jobId = 'job-abcdef123456';

const samples: Record<ChannelName, { request: unknown; response: unknown; result?: unknown }> = {
  hostInfo: { request: {}, response: { host: 'web', version: '0.1.0', workspace: 'workspace' } },
  demoStudy: { request: {}, response: { ...study, file: null } },
  chooseFile: { request: { purpose: 'data' }, response: file },
  chooseSaveTarget: { request: { purpose: 'packet', suggestedName: 'Line 3 packet.pdf' }, response: null },
  listWorkspace: { request: {}, response: { files: [file] } },
  uploadFile: {
    request: { purpose: 'key', fileName: 'signer.p12', bytes: 'AAEC' },
    response: { handle: 'h_0123456789abcdef', fileName: 'signer.p12' },
  },
  openStudy: { request: { file: file.handle }, response: { ok: true, value: study } },
  saveStudy: {
    request: { target: file.handle, document: { a: 1 }, overwriteChanged: true },
    response: { saved: false, reason: 'changed-on-disk', message: 'changed' },
  },
  setUnsaved: { request: { unsaved: true }, response: {} },
  autosave: { request: { document: { a: [1] } }, response: {} },
  listRecovery: {
    request: {},
    response: { copies: [{ recovery: file, original: null, savedAt: '2026-01-05T08:00:00.000Z' }] },
  },
  discardRecovery: { request: { file: file.handle }, response: {} },
  inspectData: {
    request: { file: file.handle },
    response: {
      ok: true,
      value: { file, sheets: ['Counts'], columns: ['lot', 'count'], preview: [['A', '1']] },
    },
  },
  importData: {
    request: {
      file: file.handle,
      mapping: { count: 'defects', units: 'panels', label: 'lot', decimal: 'comma' },
    },
    response: { jobId },
    result: {
      ok: true,
      value: {
        observations: study.observations,
        rejected: [{ row: 7, column: 'defects', value: '-1', message: 'negative' }],
        noProduction: [{ label: 'W9', row: 9, count: 0, units: 0 }],
        report: {
          file: 'counts.csv',
          sha256: null,
          rowsRead: 3,
          accepted: 1,
          rejected: [],
          settings: { headerRow: 1 },
        },
      },
    },
  },
  analyze: {
    request: { observations: study.observations, exclusions: [], options: study.options },
    response: { ok: true, value: analysis },
  },
  exportPacket: {
    request: { document: {}, format: 'pdf' },
    response: { jobId },
    result: { file, downloadUrl: '/download/abc' },
  },
  signStudy: {
    request: {
      document: {},
      meaning: 'approved',
      printedName: 'A. Example',
      role: 'Quality manager',
      key: file.handle,
      passphrase: 'correct horse',
    },
    response: { jobId },
    result: { document: { signed: true }, fingerprint: 'ab'.repeat(32) },
  },
  createSigningKey: {
    request: { printedName: 'A. Example', organization: 'Invented Works', passphrase: 'correct horse' },
    response: { jobId },
    result: { key: file, fingerprint: 'cd'.repeat(32), commonName: 'A. Example' },
  },
  revealExport: { request: { file: file.handle }, response: {} },
  cancelJob: { request: { jobId }, response: { cancelled: true } },
  jobStatus: {
    request: { jobId },
    response: { jobId, state: 'progress', fraction: 0.5, message: 'page 2 of 4' },
  },
  siteSettings: { request: {}, response: defaultSiteSettings },
  saveSiteSettings: { request: defaultSiteSettings, response: defaultSiteSettings },
};

const throughJson = (value: unknown): unknown => JSON.parse(JSON.stringify(value));

describe('the channel table', () => {
  it.each(channelNames)('%s round-trips its request, response and result through JSON unchanged', (name) => {
    const { request, response, result } = samples[name];
    const schemas = channels[name] as {
      request: import('zod').ZodType;
      response: import('zod').ZodType;
      result?: import('zod').ZodType;
    };
    const parsedRequest = schemas.request.parse(throughJson(request));
    expect(schemas.request.parse(throughJson(parsedRequest))).toEqual(parsedRequest);
    expect(parsedRequest).toEqual({ ...(request as object), ...(parsedRequest as object) });
    expect(schemas.response.parse(throughJson(response))).toEqual(response);
    if (schemas.result) expect(schemas.result.parse(throughJson(result))).toEqual(result);
    else expect(result).toBeUndefined();
  });

  it('keeps fields the engine adds to a result (the analyze contract may grow)', () => {
    const parsed = channels.analyze.response.parse(samples.analyze.response);
    expect(parsed.ok && parsed.value.periods[0]).toHaveProperty('extraField', 'passes through');
    expect(parsed.ok && parsed.value).toHaveProperty('rateEffect');
  });

  it('refuses requests that would name a path or smuggle a folder', () => {
    expect(channels.openStudy.request.safeParse({ file: '/etc/passwd' }).success).toBe(false);
    expect(channels.openStudy.request.safeParse({ file: '../../secret.ledger' }).success).toBe(false);
    for (const suggestedName of [
      '../x.ledger',
      'a/b.ledger',
      'C:\\x.ledger',
      '.hidden',
      'nul\u0000.ledger',
    ]) {
      expect(
        channels.chooseSaveTarget.request.safeParse({ purpose: 'study', suggestedName }).success,
        suggestedName,
      ).toBe(false);
    }
    expect(
      channels.uploadFile.request.safeParse({ purpose: 'data', fileName: 'a.csv', bytes: 'not base64!' })
        .success,
    ).toBe(false);
  });

  it('refuses requests with missing or mistyped fields', () => {
    expect(
      channels.analyze.request.safeParse({
        observations: [{ label: 'a', row: 2, count: -1, units: 1 }],
        exclusions: [],
        options: study.options,
      }).success,
    ).toBe(false);
    expect(
      channels.signStudy.request.safeParse({ ...(samples.signStudy.request as object), meaning: 'witnessed' })
        .success,
    ).toBe(false);
    expect(channels.hostInfo.request.safeParse({ extra: 1 }).success).toBe(false);
  });

  it('asks a new signing key for a name and a passphrase of at least 8 characters', () => {
    const request = channels.createSigningKey.request;
    expect(request.safeParse({ printedName: 'A. Example', passphrase: 'short' }).success).toBe(false);
    expect(request.safeParse({ printedName: '   ', passphrase: 'long enough' }).success).toBe(false);
    expect(request.safeParse({ printedName: 'A. Example', passphrase: 'long enough' }).success).toBe(true);
  });

  it('takes a PDF signature key for the packet as the sign channel does: a handle and a passphrase', () => {
    const packet = { document: {}, format: 'pdf' };
    const signature = { key: file.handle, passphrase: 'correct horse' };
    expect(channels.exportPacket.request.safeParse({ ...packet, signature }).success).toBe(true);
    for (const bad of [
      { key: file.handle },
      { key: file.handle, passphrase: '' },
      { key: '/home/someone/key.p12', passphrase: 'correct horse' },
      { passphrase: 'correct horse' },
    ]) {
      expect(
        channels.exportPacket.request.safeParse({ ...packet, signature: bad }).success,
        JSON.stringify(bad),
      ).toBe(false);
    }
  });

  it('describes every host event with one schema', () => {
    for (const event of [
      { type: 'job', event: { jobId, state: 'cancelled' } },
      { type: 'job', event: { jobId, state: 'failed', findings: [{ message: 'no count column' }] } },
      { type: 'menu', command: 'export-packet' },
      { type: 'file-opened', file, purpose: 'study' },
    ]) {
      expect(HostEvent.parse(throughJson(event))).toEqual(event);
    }
    expect(HostEvent.safeParse({ type: 'menu', command: 'rm -rf' }).success).toBe(false);
  });
});
