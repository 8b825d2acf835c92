import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const repo = join(import.meta.dirname, '..', '..');
const config = readFileSync(join(repo, 'electron-builder.yml'), 'utf8');
const packageJson = JSON.parse(readFileSync(join(repo, 'package.json'), 'utf8')) as { main: string };

/** Top-level and nested keys of the YAML read as text: enough to check what the packaging promises. */
const valueOf = (key: string): string | undefined =>
  new RegExp(`^\\s*${key}:\\s*(.+)$`, 'm').exec(config)?.[1].trim();

describe('the packaging configuration', () => {
  it('names the product and builds AppImage, deb, NSIS and dmg', () => {
    expect(valueOf('productName')).toBe('Limit Ledger');
    expect(valueOf('appId')).toMatch(/^[a-z]+(\.[a-z]+)+$/);
    for (const target of ['AppImage', 'deb', 'nsis', 'dmg'])
      expect(config).toMatch(new RegExp(`^\\s+- ${target}$`, 'm'));
  });

  it('associates .ledger files with the app', () => {
    expect(config).toMatch(/fileAssociations:\n\s+- ext: ledger\n/);
  });

  it('packs the built main process that package.json names, and the icon it points at exists', () => {
    expect(packageJson.main).toBe('dist/src-main/electron/main.js');
    expect(config).toMatch(/^\s+- dist\/\*\*\/\*$/m);
    const icon = readFileSync(join(repo, 'build', 'icon.png'));
    expect(icon.subarray(1, 4).toString('latin1')).toBe('PNG');
    // Width and height from the IHDR chunk: at least 512 px, as the macOS and Windows icons need.
    expect(icon.readUInt32BE(16)).toBeGreaterThanOrEqual(512);
    expect(icon.readUInt32BE(20)).toBe(icon.readUInt32BE(16));
    expect(readFileSync(join(repo, 'build', 'icon.svg'), 'utf8')).toContain('<svg');
  });
});
