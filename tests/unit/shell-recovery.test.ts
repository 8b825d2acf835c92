import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { recoveredOriginal, RecoveryStore } from '../../src-main/desktop/recovery.js';

const folders: string[] = [];
afterEach(async () => {
  await Promise.all(folders.splice(0).map((folder) => rm(folder, { recursive: true, force: true })));
});

describe('recovery copies', () => {
  it('name the study they were saved for, so a restored copy saves under that name again', async () => {
    const folder = await mkdtemp(join(tmpdir(), 'll-recovery-'));
    folders.push(folder);
    await new RecoveryStore(folder).save({ any: 'document' }, 'Line 4 baseline.ledger');
    const [copy] = await readdir(folder);
    expect(copy).toMatch(/^Line 4 baseline\.[0-9a-f]{12}\.recovery\.ledger$/);
    expect(recoveredOriginal(copy!)).toBe('Line 4 baseline.ledger');

    // The next run saves the restored study under its own name, not the copy's.
    const next = new RecoveryStore(folder);
    await next.save({ any: 'document' }, recoveredOriginal(copy!) ?? null);
    const names = (await readdir(folder)).filter((name) => name !== copy);
    expect(names).toHaveLength(1);
    expect(names[0]).toMatch(/^Line 4 baseline\.[0-9a-f]{12}\.recovery\.ledger$/);
  });

  it('tell an untitled copy (null) from a file that is no copy at all (undefined)', () => {
    expect(recoveredOriginal('untitled.0123456789ab.recovery.ledger')).toBeNull();
    expect(recoveredOriginal('Line 4 baseline.ledger')).toBeUndefined();
  });
});
