import { errorText } from '../transport/error-text.js';
import { api, ApiError } from '../transport/index.js';
import type { FileHandle } from '../../shared-core/api.js';
import { describeFinding } from '../../shared-core/result.js';
import { study } from './study.svelte.js';

/**
 * Saving and opening `.ledger` files through the host (the page never names a path), and the
 * recovery copy the host keeps after every decision so that a crash loses nothing.
 */
class StudyFile {
  file = $state.raw<FileHandle | null>(null);
  /** The document as last saved or opened, to tell whether there are unsaved changes. */
  saved = $state.raw<unknown>(null);
  status = $state('');
  error = $state('');
  readonly unsaved = $derived(study.document !== null && study.document !== this.saved);

  /** Called whenever a study is opened fresh (demo, import): it has no file yet. */
  opened(file: FileHandle | null): void {
    this.file = file;
    this.saved = file ? study.document : null;
    this.error = '';
  }

  async save(chooseNew = false): Promise<void> {
    const document = study.document;
    if (!document) return;
    this.error = '';
    try {
      let target = chooseNew ? null : this.file;
      if (!target) {
        const suggested = `${(study.meta.name || 'study')
          .replace(/[\\/:*?"<>|]+/g, '-')
          .replace(/^\.+/, '')
          .slice(0, 180)}.ledger`;
        target = await api.chooseSaveTarget({ purpose: 'study', suggestedName: suggested });
        if (!target) return;
      }
      let outcome = await api.saveStudy({ target: target.handle, document, overwriteChanged: false });
      if (!outcome.saved && outcome.reason === 'changed-on-disk') {
        if (
          !confirm(`${outcome.message}\n\nSave over it anyway? (The previous version is kept as a backup.)`)
        )
          return;
        outcome = await api.saveStudy({ target: target.handle, document, overwriteChanged: true });
      }
      if (!outcome.saved) {
        this.error = outcome.message;
        return;
      }
      this.file = outcome.file;
      this.saved = document;
      this.status = `Saved ${outcome.file.fileName}${outcome.backupKept ? ' (previous version kept as a backup)' : ''}.`;
      await api.setUnsaved({ unsaved: false }).catch(() => undefined);
    } catch (error) {
      this.error = errorText(error);
    }
  }

  async open(): Promise<boolean> {
    this.error = '';
    try {
      const chosen = await api.chooseFile({ purpose: 'study' });
      if (!chosen) return false;
      const opened = await api.openStudy({ file: chosen.handle });
      if (!opened.ok) {
        this.error = opened.findings.map(describeFinding).join('\n');
        return false;
      }
      study.loadView(opened.value);
      this.opened(opened.value.file ?? chosen);
      this.status = opened.value.readOnly
        ? `Opened ${chosen.fileName} read-only: its audit trail is broken (see History).`
        : `Opened ${chosen.fileName}.`;
      return true;
    } catch (error) {
      this.error = error instanceof ApiError ? error.message : errorText(error);
      return false;
    }
  }
}

export const studyFile = new StudyFile();
