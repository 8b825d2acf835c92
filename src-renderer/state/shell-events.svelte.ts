import { errorText } from '../transport/error-text.js';
import { changes } from './changes.svelte.js';
import { toBase64 } from '../transport/base64.js';
import { api, hostKind, type Api } from '../transport/index.js';
import type { FileHandle, HostEvent, ResponseOf } from '../../shared-core/api.js';
import { describeFinding } from '../../shared-core/result.js';
import { study, type StudyState } from './study.svelte.js';
import { studyFile } from './study-file.svelte.js';
import { navigation, type ScreenId } from './navigation.svelte.js';
import { dataImport } from './data-import.svelte.js';

export type RecoveryCopy = ResponseOf<'listRecovery'>['copies'][number];
export type HostInfo = ResponseOf<'hostInfo'>;

/** An importer a file can be handed to (the Data screen's, or the Changes screen's for new periods). */
export interface FileImporter {
  step: string;
  error: string;
  reset(): void;
  inspect(file: FileHandle): Promise<void>;
  chooseFile(file: File): Promise<void>;
}

/** What the shell wiring reaches: the host's api and the state modules the buttons already use. */
export interface ShellDependencies {
  api: Pick<
    Api,
    | 'onEvent'
    | 'setUnsaved'
    | 'autosave'
    | 'listRecovery'
    | 'discardRecovery'
    | 'openStudy'
    | 'hostInfo'
    | 'uploadFile'
  >;
  study: Pick<
    StudyState,
    'document' | 'openedDocument' | 'meta' | 'undo' | 'redo' | 'loadView' | 'readOnly' | 'lastProblem'
  >;
  studyFile: {
    readonly unsaved: boolean;
    status: string;
    error: string;
    save(chooseNew?: boolean): Promise<void>;
    open(): Promise<boolean>;
    opened(file: FileHandle | null): void;
  };
  navigation: { readonly screen: ScreenId; go(screen: ScreenId): void };
  dataImport: FileImporter;
  /** The Changes screen's importer of new periods: `showing` while that screen offers it. */
  newPeriods: { readonly showing: boolean; importer(): FileImporter };
  confirm(message: string): boolean;
  hostKind: 'electron' | 'web';
  /** How long after the last decision the recovery copy is written. */
  autosaveDelay?: number;
}

/** A recorded time in the reader's local form; a value, not reactive state. */
function shownTime(iso: string): string {
  return new globalThis.Date(iso).toLocaleString();
}

/** Ctrl+Z in a text field belongs to the field, not to the study's decisions (as in keyboard.ts). */
function typingInField(): boolean {
  const active = globalThis.document?.activeElement;
  if (!active || !(active instanceof HTMLElement)) return false;
  return ['INPUT', 'TEXTAREA', 'SELECT'].includes(active.tagName) || active.isContentEditable;
}

/**
 * The desktop shell's side of the screens: native menu commands and files that reach the window
 * (a drop, a second launch, the file association) run the same actions as the buttons; the host
 * hears whenever the study gains or loses unsaved changes, so its close prompt asks only when
 * something would be lost; a recovery copy follows each decision; and copies left by a run that
 * did not close cleanly are offered on the next start.
 */
export class ShellEvents {
  /** Recovery copies left by an earlier run, newest first, still waiting for the user's answer. */
  recovery = $state.raw<RecoveryCopy[]>([]);
  recoveryBusy = $state(false);
  recoveryError = $state('');
  /** Set while the About box is open. */
  about = $state.raw<HostInfo | null>(null);

  #deps: ShellDependencies;
  #told: boolean | null = null;
  #autosaveTimer: ReturnType<typeof setTimeout> | null = null;
  /** Settles when the first study is in; events wait for it so that the first study cannot replace theirs. */
  #started: Promise<void> = Promise.resolve();

  constructor(deps: ShellDependencies) {
    this.#deps = deps;
  }

  /**
   * Work that closing would lose. An untouched demo study is not work; a fresh import, a restored
   * recovery copy and every decision since the last save are.
   */
  get unsaved(): boolean {
    const { study, studyFile } = this.#deps;
    if (study.meta.demo && study.document === study.openedDocument) return false;
    return studyFile.unsaved;
  }

  /** Subscribes to the host's events; returns the unsubscribe function. */
  start(): () => void {
    return this.#deps.api.onEvent((event) => void this.handle(event));
  }

  /**
   * Runs after the app's first start (the demo study): a file given at launch arrives meanwhile
   * and must open after it, not under it; then copies left by a crash are offered.
   */
  async afterStartup(start: Promise<unknown>): Promise<void> {
    this.#started = start.then(
      () => undefined,
      () => undefined,
    );
    await this.#started;
    await this.checkRecovery();
  }

  async handle(event: HostEvent): Promise<void> {
    await this.#started;
    if (event.type === 'menu') await this.command(event.command);
    else if (event.type === 'file-opened') await this.fileOpened(event.file, event.purpose);
  }

  async command(command: Extract<HostEvent, { type: 'menu' }>['command']): Promise<void> {
    const { study, studyFile, navigation, dataImport } = this.#deps;
    switch (command) {
      case 'new-from-import':
        if (dataImport.step === 'done') dataImport.reset();
        navigation.go('data');
        return;
      case 'open':
        await this.openStudy();
        return;
      case 'save':
        await studyFile.save();
        return;
      case 'save-as':
        await studyFile.save(true);
        return;
      case 'export-packet':
        navigation.go('signoff');
        return;
      case 'undo':
        if (!typingInField()) study.undo();
        return;
      case 'redo':
        if (!typingInField()) study.redo();
        return;
      case 'about':
        await this.showAbout();
        return;
    }
  }

  /** Open… from the button or the menu: asks first when the open study has unsaved work. */
  async openStudy(): Promise<void> {
    if (!this.#mayReplace('open another study')) return;
    if (await this.#deps.studyFile.open()) this.#deps.navigation.go('review');
  }

  /**
   * Where a data file that reaches the window goes: into the open study as new periods while the
   * Changes screen offers that, else to a new study's import on the Data screen. Ready for a file.
   */
  #importerForData(): FileImporter {
    const { navigation, newPeriods, dataImport } = this.#deps;
    const importer =
      navigation.screen === 'changes' && newPeriods.showing ? newPeriods.importer() : dataImport;
    if (importer === dataImport) navigation.go('data');
    if (importer.step === 'done' || importer.step === 'map') importer.reset();
    return importer;
  }

  async fileOpened(file: FileHandle, purpose: string): Promise<void> {
    const { api, study, studyFile, navigation } = this.#deps;
    if (purpose === 'data') {
      const importer = this.#importerForData();
      try {
        await importer.inspect(file);
      } catch (error) {
        importer.error = `${file.fileName} could not be read: ${errorText(error)}`;
      }
      return;
    }
    if (purpose !== 'study') {
      studyFile.error = `${file.fileName} is not a study or a data file; open keys and certificates on the Sign-off screen.`;
      return;
    }
    if (!this.#mayReplace(`open ${file.fileName}`)) return;
    studyFile.error = '';
    try {
      const opened = await api.openStudy({ file: file.handle });
      if (!opened.ok) {
        studyFile.error = [
          `${file.fileName} could not be opened:`,
          ...opened.findings.map(describeFinding),
        ].join('\n');
        return;
      }
      study.loadView(opened.value);
      studyFile.opened(opened.value.file ?? file);
      studyFile.status = opened.value.readOnly
        ? `Opened ${file.fileName} read-only: its audit trail is broken (see History).`
        : `Opened ${file.fileName}.`;
      navigation.go('review');
    } catch (error) {
      studyFile.error = `${file.fileName} could not be opened: ${errorText(error)}`;
    }
  }

  /**
   * Tells the host when the unsaved state changes and, while there is unsaved work, writes a
   * recovery copy shortly after the last decision. Run it in an effect: it reads the study.
   */
  syncUnsaved(): void {
    const unsaved = this.unsaved;
    const document = this.#deps.study.document;
    if (unsaved !== this.#told) {
      this.#told = unsaved;
      void this.#deps.api.setUnsaved({ unsaved }).catch(() => undefined);
    }
    if (this.#autosaveTimer) clearTimeout(this.#autosaveTimer);
    this.#autosaveTimer = null;
    if (!unsaved || document === null) return;
    this.#autosaveTimer = setTimeout(() => {
      this.#autosaveTimer = null;
      // Saved or replaced in the meantime: the copy would be stale or needless.
      if (!this.unsaved || this.#deps.study.document !== document) return;
      void this.#deps.api.autosave({ document }).catch(() => undefined);
    }, this.#deps.autosaveDelay ?? 800);
  }

  /** The web host has no native close prompt: the browser's own leave-page question stands in. */
  beforeUnload(event: BeforeUnloadEvent): void {
    // In Electron a cancelled unload would silently keep the window open; main asks instead.
    if (this.#deps.hostKind !== 'web' || !this.unsaved) return;
    event.preventDefault();
  }

  /** The web host lets files be dropped anywhere, as the desktop shell does (its preload takes them there). */
  dragOver(event: DragEvent): void {
    if (this.#deps.hostKind === 'web' && event.dataTransfer?.types.includes('Files')) event.preventDefault();
  }

  /**
   * A file dropped outside the Data screen's own drop zone, on the web host: without this the
   * browser would leave the app to show the file. A study is uploaded and opened, anything else
   * starts an import.
   */
  async drop(event: DragEvent): Promise<void> {
    if (this.#deps.hostKind !== 'web' || event.defaultPrevented) return;
    const file = event.dataTransfer?.files[0];
    if (!file) return;
    event.preventDefault();
    const { api, studyFile } = this.#deps;
    if (!/\.ledger$/i.test(file.name)) {
      await this.#importerForData().chooseFile(file);
      return;
    }
    try {
      const safeName = file.name.replace(/[\\/:*?"<>|]+/g, '-').replace(/^\.+/, '') || 'study.ledger';
      const bytes = toBase64(new Uint8Array(await file.arrayBuffer()));
      const uploaded = await api.uploadFile({ purpose: 'study', fileName: safeName, bytes });
      await this.fileOpened(uploaded, 'study');
    } catch (error) {
      studyFile.error = `${file.name} could not be opened: ${errorText(error)}`;
    }
  }

  /** On start: asks the host for copies left by a run that did not close cleanly. */
  async checkRecovery(): Promise<void> {
    try {
      const { copies } = await this.#deps.api.listRecovery({});
      this.recovery = copies;
    } catch {
      // A host without recovery (or an old one) offers nothing; the app works on.
      this.recovery = [];
    }
  }

  async restore(copy: RecoveryCopy): Promise<void> {
    const { api, study, studyFile, navigation } = this.#deps;
    this.recoveryBusy = true;
    this.recoveryError = '';
    try {
      const opened = await api.openStudy({ file: copy.recovery.handle });
      if (!opened.ok) {
        this.recoveryError = opened.findings.map(describeFinding).join('\n');
        return;
      }
      study.loadView(opened.value);
      // The copy is not the study's file: saving must ask where the study goes.
      studyFile.opened(null);
      studyFile.status = `Restored the recovery copy of ${copy.original ?? 'an unsaved study'} from ${shownTime(copy.savedAt)}. Save it to keep it.`;
      // This run's own copy exists before the earlier one goes, so a second crash loses nothing.
      if (study.document) await api.autosave({ document: study.document });
      await api.discardRecovery({ file: copy.recovery.handle });
      this.recovery = this.recovery.filter((c) => c !== copy);
      navigation.go('review');
    } catch (error) {
      this.recoveryError = errorText(error);
    } finally {
      this.recoveryBusy = false;
    }
  }

  async discard(copy: RecoveryCopy): Promise<void> {
    this.recoveryBusy = true;
    this.recoveryError = '';
    try {
      await this.#deps.api.discardRecovery({ file: copy.recovery.handle });
      this.recovery = this.recovery.filter((c) => c !== copy);
    } catch (error) {
      this.recoveryError = errorText(error);
    } finally {
      this.recoveryBusy = false;
    }
  }

  /** Closes the offer for this run; the copies stay on disk and are offered again next start. */
  later(): void {
    this.recovery = [];
    this.recoveryError = '';
  }

  async showAbout(): Promise<void> {
    this.about = await this.#deps.api
      .hostInfo({})
      .catch(() => ({ host: this.#deps.hostKind, version: 'unknown' }) as HostInfo);
  }

  #mayReplace(what: string): boolean {
    if (!this.unsaved) return true;
    const name = this.#deps.study.meta.name || 'The open study';
    return this.#deps.confirm(
      `${name} has changes that are not saved. ${what[0]!.toUpperCase()}${what.slice(1)} anyway?\n\n` +
        'Choose Cancel, then Save, to keep them.',
    );
  }
}

export const shellEvents = new ShellEvents({
  api,
  study,
  studyFile,
  navigation,
  dataImport,
  newPeriods: {
    get showing() {
      return study.document !== null && changes.approved !== null;
    },
    importer: () => changes.newPeriodsImporter(),
  },
  confirm: (message) => globalThis.confirm(message),
  hostKind,
});
