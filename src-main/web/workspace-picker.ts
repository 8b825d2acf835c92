import { mkdir, readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { PlainFileName, type FilePurpose, type SavePurpose } from '../../shared-core/api.js';
import type { FilePicker } from '../desktop/host-handlers.js';
import { HostError } from '../desktop/host-error.js';
import type { DownloadStore } from './downloads.js';

/**
 * Files in the browser host: studies live in the workspace folder, data and key files arrive as
 * uploads (the browser's file picker or a drop), and exports leave as downloads. A save target is a
 * plain file name inside the workspace, never a path.
 */
export function workspacePicker(workspace: string, downloads: DownloadStore): FilePicker {
  return {
    async chooseFile(_purpose: FilePurpose) {
      throw new HostError(
        'use-upload',
        'in the browser, choose the file with the file picker or drop it on the page',
      );
    },
    async chooseSaveTarget(purpose: SavePurpose, suggestedName: string) {
      if (purpose !== 'study') {
        throw new HostError('use-download', 'in the browser, exports arrive as downloads');
      }
      const name = PlainFileName.parse(suggestedName);
      await mkdir(workspace, { recursive: true });
      return join(workspace, name.toLowerCase().endsWith('.ledger') ? name : `${name}.ledger`);
    },
    async listStudies() {
      const names = await readdir(workspace).catch(() => [] as string[]);
      return names
        .filter((name) => name.toLowerCase().endsWith('.ledger') && !name.startsWith('.'))
        .sort((a, b) => a.localeCompare(b))
        .map((name) => join(workspace, name));
    },
    exportDestination: (fileName: string) => downloads.reserve(fileName),
  };
}
