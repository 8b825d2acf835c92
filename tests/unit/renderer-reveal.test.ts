// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { demoObservations } from '../../shared-core/study/demo-scenario.js';

/**
 * "Show in folder" after an export (the Sign-off screen shows its button when `signOff.canReveal`):
 * offered only where the host has folders (the desktop bridge), and asking the host by the handle
 * it returned, never by a path.
 */
async function signOffOn(host: 'electron' | 'web') {
  vi.resetModules();
  const calls: { channel: string; request: unknown }[] = [];
  const global = globalThis as { limitLedger?: unknown };
  if (host === 'electron') {
    global.limitLedger = {
      invoke: async (channel: string, request: unknown) => {
        calls.push({ channel, request });
        return { ok: true, value: {} };
      },
      onEvent: () => () => undefined,
    };
  } else delete global.limitLedger;
  const { study } = await import('../../src-renderer/state/study.svelte.js');
  const { signOff } = await import('../../src-renderer/state/signoff.svelte.js');
  study.load({ name: 'Invented line', unit: 'door panel', demo: true }, demoObservations);
  return { signOff, calls };
}

afterEach(() => {
  delete (globalThis as { limitLedger?: unknown }).limitLedger;
});

describe('Show in folder after an export', () => {
  it('is offered on the desktop once a file was exported, and reveals it by its handle', async () => {
    const { signOff, calls } = await signOffOn('electron');
    expect(signOff.canReveal).toBe(false);
    signOff.lastExport = { fileName: 'Invented line.pdf', handle: 'h_0123456789abcdef' };
    expect(signOff.canReveal).toBe(true);
    await signOff.revealLast();
    expect(calls).toEqual([{ channel: 'revealExport', request: { file: 'h_0123456789abcdef' } }]);
    expect(signOff.error).toBe('');
  });

  it('says what went wrong when the host refuses', async () => {
    const { signOff } = await signOffOn('electron');
    (globalThis as { limitLedger?: { invoke: unknown } }).limitLedger!.invoke = async () => ({
      ok: false,
      error: { code: 'unknown-file', message: 'that file is no longer available; choose it again' },
    });
    signOff.lastExport = { fileName: 'Invented line.pdf', handle: 'h_0123456789abcdef' };
    await signOff.revealLast();
    expect(signOff.error).toMatch(/no longer available/);
  });

  it('is not offered on the web host, where the packet is a download', async () => {
    const { signOff, calls } = await signOffOn('web');
    signOff.lastExport = {
      fileName: 'Invented line.pdf',
      url: '/download/abc',
      handle: 'h_0123456789abcdef',
    };
    expect(signOff.canReveal).toBe(false);
    // Even a result without a download URL is not revealed: the page has no desktop bridge.
    signOff.lastExport = { fileName: 'Invented line.pdf', handle: 'h_0123456789abcdef' };
    expect(signOff.canReveal).toBe(false);
    await signOff.revealLast();
    expect(calls).toEqual([]);
  });
});
