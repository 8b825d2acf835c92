import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { shortRunTieringFlag } from '../../src-main/cli/short-run-tiering.js';

/**
 * The packet command's tiering flag is one the running V8 lists (`node --v8-options`) and takes
 * without a word: V8 prints an error for a flag it does not know, which every packet would show.
 */
describe('the short-run tiering flag', () => {
  it('is one this V8 knows, and setting it prints nothing', () => {
    const flag = shortRunTieringFlag(process.versions.v8);
    expect(flag).not.toBeNull(); // Node 20, 22 and 24 each have one
    const listed = spawnSync(process.execPath, ['--v8-options'], { encoding: 'utf8' }).stdout;
    expect(listed).toContain(`  ${flag!.split('=')[0]} (`);
    const set = spawnSync(
      process.execPath,
      ['-e', `require('node:v8').setFlagsFromString(${JSON.stringify(flag)})`],
      { encoding: 'utf8' },
    );
    expect(set.status).toBe(0);
    expect(set.stdout + set.stderr).toBe('');
  });

  // The defaults, as `node --v8-options` lists them: 67584 on Node 20.20 (V8 11.3), 3000 on
  // Node 22.23 (V8 12.4) and 24.11 (V8 13.6).
  it('is eight times the default of the V8 versions it knows, and none for others', () => {
    expect(shortRunTieringFlag('11.3.244.8-node.38')).toBe('--interrupt-budget=540672');
    expect(shortRunTieringFlag('12.4.254.21-node.57')).toBe('--invocation-count-for-turbofan=24000');
    expect(shortRunTieringFlag('13.6.233.10-node.28')).toBe('--invocation-count-for-turbofan=24000');
    expect(shortRunTieringFlag('14.1.0')).toBeNull();
    expect(shortRunTieringFlag('10.2.154.26-node.22')).toBeNull();
  });
});
