import { dirname, join } from 'node:path';
import type { JobEvent } from '../../shared-core/api.js';
import { JobRunner } from '../services/jobs/job-runner.js';
import { FileRegistry } from './file-registry.js';
import { HostEvents } from './host-events.js';
import { createHandlers, type FilePicker, type Handlers, type HostServices } from './host-handlers.js';
import { RecoveryStore } from './recovery.js';

export interface HostParts {
  handlers: Handlers;
  events: HostEvents;
  jobs: JobRunner;
  files: FileRegistry;
  recovery: RecoveryStore;
}

export interface HostSetup {
  kind: 'electron' | 'web';
  version: string;
  picker: FilePicker;
  services: HostServices;
  recoveryFolder: string;
  /** Where signing keys made in the app go; by default `keys` beside the recovery folder. */
  keysFolder?: string;
  workspaceName?: string;
  onUnsaved?(unsaved: boolean): void;
  /** Shows a file in the desktop's file manager (the Electron host only). */
  revealFile?(path: string): void;
  /** The module with the job task table (tests pass their own). */
  taskModule?: string;
}

/** Assembles the pieces both hosts share: the file handles, events, jobs and the channel handlers. */
export function createHost(setup: HostSetup): HostParts {
  const events = new HostEvents();
  const files = new FileRegistry();
  const recovery = new RecoveryStore(setup.recoveryFolder);
  const publish = (event: JobEvent): void => events.publish({ type: 'job', event });
  const jobs = setup.taskModule ? new JobRunner(publish, setup.taskModule) : new JobRunner(publish);
  const handlers = createHandlers({
    kind: setup.kind,
    version: setup.version,
    workspaceName: setup.workspaceName,
    files,
    picker: setup.picker,
    jobs,
    services: setup.services,
    recovery,
    keysFolder: setup.keysFolder ?? join(dirname(setup.recoveryFolder), 'keys'),
    onUnsaved: setup.onUnsaved,
    revealFile: setup.revealFile,
  });
  return { handlers, events, jobs, files, recovery };
}
