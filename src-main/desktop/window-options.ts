import type { WindowBounds } from './window-state.js';

/** The app's own scheme: the renderer is served from app://renderer/, never from file:// or the network. */
export const appScheme = 'app';
export const appOrigin = `${appScheme}://renderer`;
export const appEntry = `${appOrigin}/index.html`;

/**
 * The options of the one BrowserWindow (a plain object, so it is tested without Electron): the
 * renderer is isolated from Node and from the preload's world, sandboxed, and keeps web security.
 * Anything not needed is off: no webview tags, no remote fonts, no spellcheck dictionary download,
 * no insecure content, no experimental features.
 */
export function mainWindowOptions(preloadPath: string, bounds: WindowBounds) {
  return {
    ...bounds,
    minWidth: 900,
    minHeight: 600,
    show: false,
    title: 'Limit Ledger',
    backgroundColor: '#FAFAF7',
    webPreferences: {
      preload: preloadPath,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      experimentalFeatures: false,
      navigateOnDragDrop: false,
      spellcheck: false,
      safeDialogs: true,
      devTools: true,
    },
  } as const;
}

/** Only the app's own pages may load in the window; every other navigation is refused. */
export function isAllowedNavigation(url: string): boolean {
  try {
    const parsed = new URL(url);
    return `${parsed.protocol}//${parsed.host}` === appOrigin && !parsed.username && !parsed.password;
  } catch {
    return false;
  }
}

/** window.open and target=_blank never open a window; the renderer has no reason to. */
export const windowOpenHandler = () => ({ action: 'deny' as const });

/** Permission requests (camera, notifications, clipboard read, ...) are all refused. */
export const permissionHandler = (_permission: string): boolean => false;
