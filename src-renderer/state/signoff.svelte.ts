import { errorText } from '../transport/error-text.js';
import { toBase64 } from '../transport/base64.js';
import { api, hostKind } from '../transport/index.js';
import type { FileHandle } from '../../shared-core/api.js';
import { studySchema } from '../../shared-core/study/study-schema.js';
import { study } from './study.svelte.js';
import { saveDownload } from './downloads.js';

type Meaning = 'prepared' | 'reviewed' | 'approved';

export type SignOffAction = 'sign' | 'export' | 'key';

/** The Sign-off screen: who signs with which key, then the packet export with progress and cancel. */
class SignOff {
  printedName = $state('');
  role = $state('');
  meaning = $state<Meaning>('prepared');
  /** The chosen key file's name, for the screen. */
  key = $state.raw<{ fileName: string } | null>(null);
  passphrase = $state('');
  /** Put a PDF signature on the exported packet with the same key; its passphrase is asked again. */
  signPacket = $state(false);
  packetPassphrase = $state('');
  /** A personal certificate made here: the organization (optional) and the new key's passphrase, twice. */
  newKeyOpen = $state(false);
  newKeyOrganization = $state('');
  newKeyPassphrase = $state('');
  newKeyRepeat = $state('');
  busy = $state<'' | SignOffAction>('');
  /** The action the message or error below is about: the screen shows it beside that action's button. */
  about = $state<SignOffAction>('sign');
  progress = $state(0);
  progressMessage = $state('');
  message = $state('');
  error = $state('');
  /** The last export: its name, a download URL on the web host, and the host's handle to the file. */
  lastExport = $state.raw<{ fileName: string; url?: string; handle?: string } | null>(null);
  #abort: AbortController | null = null;
  /** Web host: the file the user picked, uploaded afresh for each job (the host forgets it after one). */
  #keyFile: File | null = null;
  /** Desktop: the handle of the path chosen in the system's dialog, which the host keeps. */
  #keyHandle: FileHandle | null = null;

  chooseKeyFile(file: File): void {
    this.#report('sign');
    this.#keyFile = file;
    this.#keyHandle = null;
    this.key = { fileName: file.name };
    this.signPacket = true;
  }

  /** A handle the host can read the key from for one job. */
  async #keyForJob(): Promise<string> {
    if (this.#keyHandle) return this.#keyHandle.handle;
    if (!this.#keyFile) throw new Error('choose a key file first');
    const bytes = new Uint8Array(await this.#keyFile.arrayBuffer());
    const name = this.#keyFile.name.replace(/[\\/:*?"<>|]+/g, '-').replace(/^\.+/, '') || 'key.p12';
    const uploaded = await api.uploadFile({ purpose: 'key', fileName: name, bytes: toBase64(bytes) });
    return uploaded.handle;
  }

  /** In the desktop app the key file comes from the system's dialog; the page never sees its path. */
  async chooseKeyWithDialog(): Promise<void> {
    this.#report('sign');
    try {
      const chosen = await api.chooseFile({ purpose: 'key' });
      if (chosen) {
        this.#keyHandle = chosen;
        this.#keyFile = null;
        this.key = { fileName: chosen.fileName };
        this.signPacket = true;
      }
    } catch (error) {
      this.error = errorText(error);
    }
  }

  /**
   * Makes a personal signing certificate for the printed name. The host keeps the encrypted key in
   * the user's data folder and hands back a handle to it, which becomes the chosen key.
   */
  async createKey(): Promise<void> {
    const missing: string[] = [];
    if (!this.printedName.trim()) missing.push('your printed name');
    if (this.newKeyPassphrase.length < 8) missing.push('a passphrase of at least 8 characters');
    else if (this.newKeyPassphrase !== this.newKeyRepeat) missing.push('the same passphrase typed twice');
    if (missing.length > 0) {
      this.#report('key', `Still needed for a personal certificate: ${missing.join(', ')}.`);
      return;
    }
    await this.#run('key', async (signal) => {
      const organization = this.newKeyOrganization.trim();
      const made = await api.runJob(
        'createSigningKey',
        {
          printedName: this.printedName.trim(),
          ...(organization ? { organization } : {}),
          passphrase: this.newKeyPassphrase,
        },
        { signal, onProgress: (f, m) => this.#progress(f, m) },
      );
      this.#keyHandle = made.key;
      this.#keyFile = null;
      this.key = { fileName: made.key.fileName };
      this.signPacket = true;
      this.newKeyPassphrase = '';
      this.newKeyRepeat = '';
      this.newKeyOpen = false;
      // The form folds away: what it made is said beside Sign, the next step.
      this.about = 'sign';
      this.message = `Made a self-issued certificate for ${made.commonName} (${made.fingerprint.slice(0, 16)}…), kept encrypted as ${made.key.fileName} in the app's data folder. Sign with it using the passphrase you just chose.`;
    });
  }

  get missing(): string[] {
    const missing: string[] = [];
    if (!this.printedName.trim()) missing.push('your printed name');
    if (!this.role.trim()) missing.push('your role');
    if (!this.key) missing.push('a key file (.p12)');
    if (!this.passphrase) missing.push('its passphrase');
    return missing;
  }

  async sign(): Promise<void> {
    const document = study.document;
    if (!document || !this.key || this.missing.length > 0) {
      this.#report('sign', `Still needed: ${this.missing.join(', ')}.`);
      return;
    }
    await this.#run('sign', async (signal) => {
      const key = await this.#keyForJob();
      const signed = await api.runJob(
        'signStudy',
        {
          document,
          meaning: this.meaning,
          printedName: this.printedName.trim(),
          role: this.role.trim(),
          key,
          passphrase: this.passphrase,
        },
        { signal, onProgress: (f, m) => this.#progress(f, m) },
      );
      const parsed = studySchema.safeParse(signed.document);
      if (!parsed.success) throw new Error('the host returned a study that does not match the schema');
      study.replaceDocument(parsed.data);
      this.passphrase = '';
      this.message = `Signed as ${this.meaning} by ${this.printedName} (certificate ${signed.fingerprint.slice(0, 16)}…).`;
    });
  }

  async exportPacket(format: 'pdf' | 'workbook'): Promise<void> {
    const document = study.document;
    if (!document) return;
    const signing = format === 'pdf' && this.signPacket;
    if (signing && (!this.key || !this.packetPassphrase)) {
      this.#report(
        'export',
        `Still needed for the PDF signature: ${!this.key ? 'a key file (.p12), chosen under Sign' : 'the passphrase of the key'}; or export it unsigned.`,
      );
      return;
    }
    await this.#run('export', async (signal) => {
      let target: string | undefined;
      if (hostKind === 'electron') {
        const suggested = `${study.meta.name || 'study'}.${format === 'pdf' ? 'pdf' : 'xlsx'}`.replace(
          /[\\/:*?"<>|]+/g,
          '-',
        );
        const chosen = await api.chooseSaveTarget({
          purpose: format === 'pdf' ? 'packet' : 'workbook',
          suggestedName: suggested,
        });
        if (!chosen) return;
        target = chosen.handle;
      }
      const signature = signing ? { key: await this.#keyForJob(), passphrase: this.packetPassphrase } : null;
      const result = await api.runJob(
        'exportPacket',
        { document, format, ...(target ? { target } : {}), ...(signature ? { signature } : {}) },
        { signal, onProgress: (f, m) => this.#progress(f, m) },
      );
      if (signature) this.packetPassphrase = '';
      this.lastExport = {
        fileName: result.file.fileName,
        url: result.downloadUrl,
        handle: result.file.handle,
      };
      // On the web host the packet arrives as a download; on the desktop it is already where the user chose.
      if (result.downloadUrl) saveDownload(result.file.fileName, result.downloadUrl);
      const what = format === 'pdf' ? 'PDF packet' : 'workbook';
      this.message = result.signedBy
        ? `The ${what} ${result.file.fileName} is ready, signed with certificate ${result.signedBy.slice(0, 16)}…`
        : `The ${what} ${result.file.fileName} is ready${format === 'pdf' ? ', without a PDF signature' : ''}.`;
    });
  }

  /** Only the desktop has folders to show; a download on the web host is in the browser's list. */
  get canReveal(): boolean {
    return (
      hostKind === 'electron' && this.lastExport?.handle !== undefined && this.lastExport.url === undefined
    );
  }

  /** Shows the last exported file in the desktop's file manager (the host knows where it wrote it). */
  async revealLast(): Promise<void> {
    const handle = this.lastExport?.handle;
    if (!this.canReveal || handle === undefined) return;
    this.#report('export');
    try {
      await api.revealExport({ file: handle });
    } catch (error) {
      this.error = errorText(error);
    }
  }

  cancel(): void {
    this.#abort?.abort();
  }

  #progress(fraction: number, message: string): void {
    this.progress = fraction;
    this.progressMessage = message;
  }

  /** Clears what was said, and says `error` (if any) about `action`. */
  #report(action: SignOffAction, error = ''): void {
    this.about = action;
    this.message = '';
    this.error = error;
  }

  async #run(kind: SignOffAction, work: (signal: AbortSignal) => Promise<void>): Promise<void> {
    this.#report(kind);
    this.busy = kind;
    this.progress = 0;
    this.#abort = new AbortController();
    try {
      await work(this.#abort.signal);
    } catch (error) {
      this.error = errorText(error);
    } finally {
      this.busy = '';
      this.#abort = null;
    }
  }
}

export const signOff = new SignOff();
