import { homedir } from 'node:os';
import { join } from 'node:path';

/**
 * The user's data folder for Limit Ledger, where the platform expects applications to keep their
 * data (the same folder Electron calls userData for an app named "Limit Ledger").
 */
export function userDataFolder(
  env: NodeJS.ProcessEnv = process.env,
  platform: NodeJS.Platform = process.platform,
): string {
  if (platform === 'win32') return join(env.APPDATA ?? join(homedir(), 'AppData', 'Roaming'), 'Limit Ledger');
  if (platform === 'darwin') return join(homedir(), 'Library', 'Application Support', 'Limit Ledger');
  return join(env.XDG_CONFIG_HOME || join(homedir(), '.config'), 'Limit Ledger');
}

export interface DataFolders {
  root: string;
  workspace: string;
  recovery: string;
  logs: string;
  siteSettings: string;
}

export function dataFolders(root: string): DataFolders {
  return {
    root,
    workspace: join(root, 'workspace'),
    recovery: join(root, 'recovery'),
    logs: join(root, 'logs'),
    siteSettings: join(root, 'site-settings.json'),
  };
}
