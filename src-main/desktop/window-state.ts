import { readFile, writeFile } from 'node:fs/promises';

export interface WindowBounds {
  x?: number;
  y?: number;
  width: number;
  height: number;
}

export interface WindowState extends WindowBounds {
  maximized: boolean;
}

export interface DisplayArea {
  x: number;
  y: number;
  width: number;
  height: number;
}

export const defaultWindowState: WindowState = { width: 1280, height: 860, maximized: false };

/**
 * The remembered window, kept on a screen that still exists: a window saved on a monitor that is
 * gone now (a laptop off its dock) opens centered on the primary display instead of off-screen.
 */
export function fitToDisplays(state: WindowState, displays: readonly DisplayArea[]): WindowState {
  const width = clamp(Math.round(state.width), 600, 10_000);
  const height = clamp(Math.round(state.height), 400, 10_000);
  if (state.x === undefined || state.y === undefined) return { width, height, maximized: state.maximized };
  const visible = displays.some(
    (area) =>
      state.x! + 80 <= area.x + area.width &&
      state.x! + width - 80 >= area.x &&
      state.y! >= area.y &&
      state.y! + 40 <= area.y + area.height,
  );
  if (!visible) return { width, height, maximized: state.maximized };
  return { x: Math.round(state.x), y: Math.round(state.y), width, height, maximized: state.maximized };
}

export async function readWindowState(path: string): Promise<WindowState> {
  try {
    const json = JSON.parse(await readFile(path, 'utf8')) as Partial<WindowState>;
    const number = (value: unknown): value is number => typeof value === 'number' && Number.isFinite(value);
    if (!number(json.width) || !number(json.height)) return defaultWindowState;
    return {
      width: json.width,
      height: json.height,
      ...(number(json.x) && number(json.y) ? { x: json.x, y: json.y } : {}),
      maximized: json.maximized === true,
    };
  } catch {
    return defaultWindowState;
  }
}

export async function writeWindowState(path: string, state: WindowState): Promise<void> {
  await writeFile(path, `${JSON.stringify(state)}\n`).catch(() => undefined);
}

function clamp(value: number, low: number, high: number): number {
  return Number.isFinite(value) ? Math.min(high, Math.max(low, value)) : low;
}
