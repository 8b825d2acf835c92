// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import {
  ShellEvents,
  type RecoveryCopy,
  type ShellDependencies,
} from '../../src-renderer/state/shell-events.svelte.js';
import { StudyState } from '../../src-renderer/state/study.svelte.js';
import type { ScreenId } from '../../src-renderer/state/navigation.svelte.js';
import type { FileHandle, HostEvent, StudyView } from '../../shared-core/api.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';

// Invented periods (not a published example): an imaginary reel line, period 4 planted high.
const observations: Observation[] = [10, 12, 9, 40, 11, 8, 10, 13, 9, 11].map((count, i) => ({
  label: `R${i + 1}`,
  row: i + 2,
  count,
  units: 5,
}));
const cause = { category: 'Material', description: 'wrong resin lot' };

const handle = (name: string, id = 'handle-' + name.replace(/[^A-Za-z0-9]/g, '')): FileHandle => ({
  handle: id.padEnd(8, 'x'),
  fileName: name,
});

/** A saved study document made by the real study state, as the host would hand it back. */
function viewOf(title: string, file: FileHandle | null): StudyView {
  const maker = new StudyState();
  maker.load({ name: title, unit: 'reel', demo: false }, observations);
  return {
    file,
    title,
    unitName: 'reel',
    document: maker.document,
    observations,
    exclusions: [],
    options: defaultOptions,
    readOnly: false,
    findings: [],
  };
}

interface Setup {
  shell: ShellEvents;
  study: StudyState;
  calls: { channel: string; request: unknown }[];
  actions: string[];
  screen: () => ScreenId | null;
  studyFile: ShellDependencies['studyFile'] & { saved: unknown; openedWith: FileHandle | null | undefined };
  dataImport: ShellDependencies['dataImport'];
  emit: (event: HostEvent) => void;
  listeners: Set<(event: HostEvent) => void>;
}

function setup(
  options: {
    demo?: boolean;
    confirm?: boolean;
    hostKind?: 'electron' | 'web';
    openStudy?: (file: string) => unknown;
    copies?: RecoveryCopy[];
    /** The screen shown when the event arrives, and whether Changes offers its importer there. */
    screen?: ScreenId;
    newPeriodsShowing?: boolean;
  } = {},
): Setup {
  const study = new StudyState();
  study.load({ name: 'Reel line', unit: 'reel', demo: options.demo ?? false }, observations);
  const calls: Setup['calls'] = [];
  const actions: string[] = [];
  const listeners = new Set<(event: HostEvent) => void>();
  let screen: ScreenId | null = options.screen ?? null;
  const record = (channel: string, request: unknown): void => void calls.push({ channel, request });

  const api = {
    onEvent(listener: (event: HostEvent) => void) {
      listeners.add(listener);
      return () => void listeners.delete(listener);
    },
    async setUnsaved(request: { unsaved: boolean }) {
      record('setUnsaved', request);
      return {};
    },
    async autosave(request: { document: unknown }) {
      record('autosave', request);
      return {};
    },
    async listRecovery() {
      record('listRecovery', {});
      return { copies: options.copies ?? [] };
    },
    async discardRecovery(request: { file: string }) {
      record('discardRecovery', request);
      return {};
    },
    async openStudy(request: { file: string }) {
      record('openStudy', request);
      return (
        options.openStudy ?? (() => ({ ok: true, value: viewOf('Opened study', handle('opened.ledger')) }))
      )(request.file);
    },
    async uploadFile(request: { purpose: string; fileName: string; bytes: string }) {
      record('uploadFile', request);
      return handle(request.fileName, 'uploaded-study');
    },
    async hostInfo() {
      record('hostInfo', {});
      return { host: 'electron' as const, version: '9.9.9' };
    },
  } as unknown as ShellDependencies['api'];

  const studyFile: Setup['studyFile'] = {
    saved: null,
    openedWith: undefined,
    status: '',
    error: '',
    // As the real study-file state: unsaved when the document is not the one last saved or opened.
    get unsaved() {
      return study.document !== null && study.document !== this.saved;
    },
    async save(chooseNew = false) {
      actions.push(chooseNew ? 'save-as' : 'save');
      this.saved = study.document;
    },
    async open() {
      actions.push('open');
      return true;
    },
    opened(file) {
      this.openedWith = file;
      this.saved = file ? study.document : null;
    },
  };
  const dataImport: Setup['dataImport'] = {
    step: 'choose',
    error: '',
    reset() {
      actions.push('import-reset');
    },
    async inspect(file) {
      actions.push(`inspect ${file.handle}`);
    },
    async chooseFile(file) {
      actions.push(`choose ${file.name}`);
    },
  };
  // The Changes screen's importer: its actions are told apart from the Data screen's.
  const newPeriods: ShellDependencies['dataImport'] = {
    step: 'choose',
    error: '',
    reset() {
      actions.push('new-periods-reset');
    },
    async inspect(file) {
      actions.push(`new periods: inspect ${file.handle}`);
    },
    async chooseFile(file) {
      actions.push(`new periods: choose ${file.name}`);
    },
  };
  const shell = new ShellEvents({
    api,
    study,
    studyFile,
    navigation: {
      get screen() {
        return screen ?? 'review';
      },
      go: (id) => void (screen = id),
    },
    dataImport,
    newPeriods: {
      showing: options.newPeriodsShowing ?? false,
      importer: () => newPeriods,
    },
    confirm: (message) => {
      actions.push(`confirm: ${message.split('\n')[0]}`);
      return options.confirm ?? true;
    },
    hostKind: options.hostKind ?? 'electron',
    autosaveDelay: 800,
  });
  return {
    shell,
    study,
    calls,
    actions,
    screen: () => screen,
    studyFile,
    dataImport,
    listeners,
    emit: (event) => {
      for (const listener of listeners) listener(event);
    },
  };
}

const flush = () => new Promise((resolve) => setTimeout(resolve, 0));

afterEach(() => {
  vi.useRealTimers();
  document.body.innerHTML = '';
});

describe('menu commands from the native menus', () => {
  it('runs the same actions as the buttons and shortcuts', async () => {
    const s = setup();
    const stop = s.shell.start();
    expect(s.listeners.size).toBe(1);

    s.emit({ type: 'menu', command: 'save' });
    s.emit({ type: 'menu', command: 'save-as' });
    await flush();
    expect(s.actions).toEqual(['save', 'save-as']);

    s.emit({ type: 'menu', command: 'export-packet' });
    await flush();
    expect(s.screen()).toBe('signoff');
    s.emit({ type: 'menu', command: 'new-from-import' });
    await flush();
    expect(s.screen()).toBe('data');

    // Saved, so Open does not ask; it goes to Review once a study is open.
    s.emit({ type: 'menu', command: 'open' });
    await flush();
    expect(s.actions).toEqual(['save', 'save-as', 'open']);
    expect(s.screen()).toBe('review');

    stop();
    expect(s.listeners.size).toBe(0);
  });

  it('undoes and redoes study decisions, but leaves Ctrl+Z in a text field to the field', async () => {
    const s = setup();
    expect(s.study.exclude(3, cause)).toBe(true);
    await s.shell.command('undo');
    expect(s.study.exclusions).toEqual([]);
    await s.shell.command('redo');
    expect(s.study.exclusions.map((e) => e.index)).toEqual([3]);

    const field = document.createElement('input');
    document.body.append(field);
    field.focus();
    await s.shell.command('undo');
    expect(s.study.exclusions.map((e) => e.index)).toEqual([3]);
  });

  it('starts a new import afresh only when the last one is finished', async () => {
    const s = setup();
    s.dataImport.step = 'map';
    await s.shell.command('new-from-import');
    expect(s.actions).toEqual([]);
    s.dataImport.step = 'done';
    await s.shell.command('new-from-import');
    expect(s.actions).toEqual(['import-reset']);
  });

  it('asks before Open replaces unsaved work, and stays put when told no', async () => {
    const s = setup({ confirm: false });
    await s.shell.command('open');
    expect(s.actions).toEqual([
      'confirm: Reel line has changes that are not saved. Open another study anyway?',
    ]);
    expect(s.screen()).toBe(null);
  });

  it('shows the host version in About', async () => {
    const s = setup();
    await s.shell.command('about');
    expect(s.shell.about).toEqual({ host: 'electron', version: '9.9.9' });
  });
});

describe('files that reach the window', () => {
  it('opens a dropped study by its handle and names it', async () => {
    const s = setup();
    s.studyFile.saved = s.study.document;
    const dropped = handle('line 4.ledger');
    await s.shell.handle({ type: 'file-opened', file: dropped, purpose: 'study' });
    expect(s.calls).toEqual([{ channel: 'openStudy', request: { file: dropped.handle } }]);
    expect(s.study.meta.name).toBe('Opened study');
    // The host's own handle of the opened file, so that Save writes back to it.
    expect(s.studyFile.openedWith).toEqual(handle('opened.ledger'));
    expect(s.studyFile.status).toBe('Opened line 4.ledger.');
    expect(s.screen()).toBe('review');
    expect(s.actions).toEqual([]);
  });

  it('says which dropped file could not be opened and why, keeping the open study', async () => {
    const s = setup({
      openStudy: () => ({ ok: false, findings: [{ file: 'bad.ledger', message: 'not a study file' }] }),
    });
    const before = s.study.document;
    await s.shell.fileOpened(handle('bad.ledger'), 'study');
    expect(s.studyFile.error).toMatch(/^bad\.ledger could not be opened:\n.*not a study file/);
    expect(s.study.document).toBe(before);
  });

  it('does not replace unsaved work when the user declines', async () => {
    const s = setup({ confirm: false });
    await s.shell.fileOpened(handle('other.ledger'), 'study');
    expect(s.actions).toEqual([
      'confirm: Reel line has changes that are not saved. Open other.ledger anyway?',
    ]);
    expect(s.calls).toEqual([]);
  });

  it('opens a file given at launch after the first study is in, not under it', async () => {
    const s = setup();
    const stop = s.shell.start();
    let finishStart = (): void => undefined;
    const starting = s.shell.afterStartup(new Promise<void>((resolve) => (finishStart = resolve)));
    s.emit({ type: 'file-opened', file: handle('launched.ledger'), purpose: 'study' });
    await flush();
    expect(s.calls).toEqual([]);
    // The first start opens the demo, then the launched file follows it.
    s.study.load({ name: 'Demo', unit: 'panel', demo: true }, observations);
    finishStart();
    await starting;
    await flush();
    expect(s.calls.map((c) => c.channel)).toEqual(['listRecovery', 'openStudy']);
    expect(s.study.meta.name).toBe('Opened study');
    stop();
  });

  it('starts an import of a dropped data file on the Data screen', async () => {
    const s = setup();
    const data = handle('shifts.csv');
    await s.shell.handle({ type: 'file-opened', file: data, purpose: 'data' });
    expect(s.screen()).toBe('data');
    expect(s.actions).toEqual([`inspect ${data.handle}`]);
    // An import does not replace the study until it runs, so nothing is asked.
    expect(s.calls).toEqual([]);
  });

  it('adds a data file dropped on the Changes screen to the study as new periods', async () => {
    const s = setup({ screen: 'changes', newPeriodsShowing: true });
    const data = handle('after-approval.csv');
    await s.shell.handle({ type: 'file-opened', file: data, purpose: 'data' });
    expect(s.screen()).toBe('changes');
    expect(s.actions).toEqual([`new periods: inspect ${data.handle}`]);
  });

  it('starts a new study from a file dropped on Changes when there are no approved limits to add to', async () => {
    const s = setup({ screen: 'changes', newPeriodsShowing: false });
    const data = handle('shifts.csv');
    await s.shell.handle({ type: 'file-opened', file: data, purpose: 'data' });
    expect(s.screen()).toBe('data');
    expect(s.actions).toEqual([`inspect ${data.handle}`]);
  });

  it('turns a failed read of a dropped data file into a message naming it', async () => {
    const s = setup();
    s.dataImport.inspect = async () => {
      throw new Error('the file is empty');
    };
    await s.shell.fileOpened(handle('empty.csv'), 'data');
    expect(s.dataImport.error).toBe('empty.csv could not be read: the file is empty');
  });
});

describe('files dropped on the window in the browser', () => {
  function dropOf(file: File, prevented = false) {
    let defaultPrevented = prevented;
    return {
      get defaultPrevented() {
        return defaultPrevented;
      },
      preventDefault: () => void (defaultPrevented = true),
      dataTransfer: { files: [file], types: ['Files'] },
    } as unknown as DragEvent;
  }
  const bytes = new TextEncoder().encode('{"invented":true}');

  it('uploads a dropped study and opens it by the handle the host gave', async () => {
    const s = setup({ hostKind: 'web' });
    s.studyFile.saved = s.study.document;
    const event = dropOf(new File([bytes], 'line 4.ledger'));
    await s.shell.drop(event);
    expect(event.defaultPrevented).toBe(true);
    expect(s.calls).toEqual([
      {
        channel: 'uploadFile',
        request: {
          purpose: 'study',
          fileName: 'line 4.ledger',
          bytes: Buffer.from(bytes).toString('base64'),
        },
      },
      { channel: 'openStudy', request: { file: 'uploaded-study' } },
    ]);
    expect(s.study.meta.name).toBe('Opened study');
  });

  it('starts an import of any other dropped file on the Data screen', async () => {
    const s = setup({ hostKind: 'web' });
    await s.shell.drop(dropOf(new File([bytes], 'shifts.csv')));
    expect(s.screen()).toBe('data');
    expect(s.actions).toEqual(['choose shifts.csv']);
  });

  it('adds a file dropped on the Changes screen to the study as new periods', async () => {
    const s = setup({ hostKind: 'web', screen: 'changes', newPeriodsShowing: true });
    await s.shell.drop(dropOf(new File([bytes], 'after-approval.csv')));
    expect(s.screen()).toBe('changes');
    expect(s.actions).toEqual(['new periods: choose after-approval.csv']);
  });

  it('leaves drops to the Data screen’s own zone, and to the preload on the desktop', async () => {
    const web = setup({ hostKind: 'web' });
    await web.shell.drop(dropOf(new File([bytes], 'shifts.csv'), true));
    const desktop = setup({ hostKind: 'electron' });
    const event = dropOf(new File([bytes], 'shifts.csv'));
    await desktop.shell.drop(event);
    expect(event.defaultPrevented).toBe(false);
    expect([...web.actions, ...desktop.actions, ...web.calls, ...desktop.calls]).toEqual([]);
  });
});

describe('unsaved changes and autosave', () => {
  it('does not count an untouched demo as unsaved work, but a decision on it', () => {
    vi.useFakeTimers();
    const s = setup({ demo: true });
    s.shell.syncUnsaved();
    s.shell.syncUnsaved();
    expect(s.calls).toEqual([{ channel: 'setUnsaved', request: { unsaved: false } }]);
    vi.advanceTimersByTime(5000);
    expect(s.calls.map((c) => c.channel)).toEqual(['setUnsaved']);

    s.study.exclude(3, cause);
    s.shell.syncUnsaved();
    expect(s.calls.at(-1)).toEqual({ channel: 'setUnsaved', request: { unsaved: true } });
  });

  it('tells the host once per change and writes a recovery copy after the last decision', () => {
    vi.useFakeTimers();
    const s = setup();
    s.shell.syncUnsaved();
    expect(s.calls).toEqual([{ channel: 'setUnsaved', request: { unsaved: true } }]);
    vi.advanceTimersByTime(500);
    s.study.exclude(3, cause);
    s.shell.syncUnsaved();
    vi.advanceTimersByTime(500);
    expect(s.calls.map((c) => c.channel)).toEqual(['setUnsaved']);
    vi.advanceTimersByTime(300);
    expect(s.calls).toEqual([
      { channel: 'setUnsaved', request: { unsaved: true } },
      { channel: 'autosave', request: { document: s.study.document } },
    ]);
  });

  it('drops a pending recovery copy when the study is saved first, and says it is saved', async () => {
    vi.useFakeTimers();
    const s = setup();
    s.shell.syncUnsaved();
    await s.shell.command('save');
    s.shell.syncUnsaved();
    vi.advanceTimersByTime(2000);
    expect(s.calls).toEqual([
      { channel: 'setUnsaved', request: { unsaved: true } },
      { channel: 'setUnsaved', request: { unsaved: false } },
    ]);
  });

  it('lets the browser ask before leaving the page with unsaved work on the web host only', () => {
    const event = () => new Event('beforeunload', { cancelable: true }) as BeforeUnloadEvent;
    const web = setup({ hostKind: 'web' });
    const leaving = event();
    web.shell.beforeUnload(leaving);
    expect(leaving.defaultPrevented).toBe(true);

    web.studyFile.saved = web.study.document;
    const clean = event();
    web.shell.beforeUnload(clean);
    expect(clean.defaultPrevented).toBe(false);

    // In Electron, main's own prompt asks; a cancelled unload would keep the window open silently.
    const desktop = setup({ hostKind: 'electron' });
    const closing = event();
    desktop.shell.beforeUnload(closing);
    expect(closing.defaultPrevented).toBe(false);
  });
});

describe('recovery copies from a run that did not close cleanly', () => {
  const copy = (name: string | null, id: string): RecoveryCopy => ({
    recovery: handle(`${name ?? 'untitled'}.0123456789ab.recovery.ledger`, id),
    original: name === null ? null : `${name}.ledger`,
    savedAt: '2026-03-02T09:15:00.000Z',
  });

  it('restores a copy as an unsaved study, keeps a fresh copy, then discards the old one', async () => {
    const first = copy('line 4', 'recovery-one');
    const second = copy(null, 'recovery-two');
    const s = setup({
      demo: true,
      copies: [first, second],
      openStudy: () => ({
        ok: true,
        value: viewOf('Line 4 baseline', handle('line 4.0123456789ab.recovery.ledger')),
      }),
    });
    await s.shell.checkRecovery();
    expect(s.shell.recovery).toEqual([first, second]);

    await s.shell.restore(first);
    expect(s.study.meta.name).toBe('Line 4 baseline');
    // The copy is not the study's file: Save must ask where the study goes.
    expect(s.studyFile.openedWith).toBe(null);
    expect(s.shell.unsaved).toBe(true);
    expect(s.studyFile.status).toMatch(
      /^Restored the recovery copy of line 4\.ledger from .+\. Save it to keep it\.$/,
    );
    expect(s.calls.map((c) => c.channel)).toEqual([
      'listRecovery',
      'openStudy',
      'autosave',
      'discardRecovery',
    ]);
    expect(s.calls[1].request).toEqual({ file: 'recovery-one' });
    expect(s.calls[2].request).toEqual({ document: s.study.document });
    expect(s.calls[3].request).toEqual({ file: 'recovery-one' });
    expect(s.shell.recovery).toEqual([second]);
    expect(s.screen()).toBe('review');
  });

  it('discards a copy on request and keeps the rest for later', async () => {
    const first = copy('line 4', 'recovery-one');
    const s = setup({ copies: [first] });
    await s.shell.checkRecovery();
    const before = s.study.document;
    await s.shell.discard(first);
    expect(s.calls.map((c) => c.channel)).toEqual(['listRecovery', 'discardRecovery']);
    expect(s.shell.recovery).toEqual([]);
    expect(s.study.document).toBe(before);
  });

  it('closes the offer on "later" without touching the copies', async () => {
    const s = setup({ copies: [copy('line 4', 'recovery-one')] });
    await s.shell.checkRecovery();
    s.shell.later();
    expect(s.shell.recovery).toEqual([]);
    expect(s.calls.map((c) => c.channel)).toEqual(['listRecovery']);
  });

  it('keeps a copy that cannot be opened on offer, with the reason, and deletes nothing', async () => {
    const first = copy('line 4', 'recovery-one');
    const s = setup({
      copies: [first],
      openStudy: () => ({
        ok: false,
        findings: [{ file: 'line 4.ledger', message: 'the audit chain is cut short' }],
      }),
    });
    await s.shell.checkRecovery();
    await s.shell.restore(first);
    expect(s.shell.recoveryError).toMatch(/the audit chain is cut short/);
    expect(s.shell.recovery).toEqual([first]);
    expect(s.calls.map((c) => c.channel)).toEqual(['listRecovery', 'openStudy']);
  });

  it('offers nothing when the host cannot list copies', async () => {
    const failing = new ShellEvents({
      ...({} as ShellDependencies),
      api: {
        listRecovery: async () => {
          throw new Error('unavailable');
        },
      } as unknown as ShellDependencies['api'],
    });
    await failing.checkRecovery();
    expect(failing.recovery).toEqual([]);
  });
});
