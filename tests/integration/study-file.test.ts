import {
  chmodSync,
  existsSync,
  mkdtempSync,
  readFileSync,
  readdirSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openStudyFile, saveStudyCopy, saveStudyFile } from '../../src-main/services/study-file.js';
import { exclude } from '../../shared-core/study/study-state.js';
import { formatStudy } from '../../shared-core/study/study-text.js';
import type { Result } from '../../shared-core/result.js';
import { at, fullStudy, sampleStudy } from './fixtures/study-sample.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};

let folder: string;
beforeEach(() => {
  folder = mkdtempSync(join(tmpdir(), 'll-study-file-'));
});
afterEach(() => rmSync(folder, { recursive: true, force: true }));

describe('study files', () => {
  it('save, open, save gives identical bytes, and every field survives', async () => {
    const path = join(folder, 'baseline.ledger');
    const study = fullStudy();
    const first = value(await saveStudyFile(path, study, { expectedDiskHash: null }));
    const bytes = readFileSync(path);
    const opened = value(await openStudyFile(path));
    expect(opened).toMatchObject({
      readOnly: false,
      problems: [],
      diskHash: first.diskHash,
      migratedFrom: null,
    });
    expect(opened.study).toEqual(JSON.parse(JSON.stringify(study)));
    const second = value(await saveStudyFile(path, opened.study, { expectedDiskHash: opened.diskHash }));
    expect(readFileSync(path).equals(bytes)).toBe(true);
    expect(second.diskHash).toBe(first.diskHash);
    expect(second.backup).toBe(`${path}.bak`);
    expect(readFileSync(`${path}.bak`).equals(bytes)).toBe(true);
  });

  it('keeps the previous version as <name>.bak and leaves no temporary files', async () => {
    const path = join(folder, 'line-4.ledger');
    const one = sampleStudy();
    const saved = value(await saveStudyFile(path, one, { expectedDiskHash: null }));
    expect(saved.backup).toBeNull();
    const two = value(
      exclude(
        one,
        { who: 'A. Tester', index: 1, cause: { category: 'Material', description: 'wet lot' } },
        at(1),
      ),
    );
    value(await saveStudyFile(path, two, { expectedDiskHash: saved.diskHash }));
    expect(readFileSync(`${path}.bak`, 'utf8')).toBe(formatStudy(one));
    expect(readFileSync(path, 'utf8')).toBe(formatStudy(two));
    expect(readdirSync(folder).sort()).toEqual(['line-4.ledger', 'line-4.ledger.bak']);
  });

  it.skipIf(process.platform === 'win32')('keeps the permissions of the file it replaces', async () => {
    const path = join(folder, 'private.ledger');
    const saved = value(await saveStudyFile(path, sampleStudy(), { expectedDiskHash: null }));
    chmodSync(path, 0o600);
    const next = value(
      exclude(
        sampleStudy(),
        { who: 'A. Tester', index: 0, cause: { category: 'x', description: 'y' } },
        at(1),
      ),
    );
    value(await saveStudyFile(path, next, { expectedDiskHash: saved.diskHash }));
    expect(statSync(path).mode & 0o777).toBe(0o600);
  });

  it('refuses to overwrite a file that another process changed since it was opened', async () => {
    const path = join(folder, 'shared.ledger');
    value(await saveStudyFile(path, sampleStudy(), { expectedDiskHash: null }));
    const opened = value(await openStudyFile(path));
    // Another process appends a decision and saves, as a second window would.
    const other = spawnSync(
      process.execPath,
      [
        '-e',
        `const fs = require('node:fs'); const t = fs.readFileSync(process.argv[1], 'utf8'); fs.writeFileSync(process.argv[1], t.replace('"owner": "A. Tester"', '"owner": "B. Other"'));`,
        path,
      ],
      { encoding: 'utf8' },
    );
    expect(other.status).toBe(0);
    const theirs = readFileSync(path);
    const mine = value(
      exclude(
        opened.study,
        { who: 'A. Tester', index: 2, cause: { category: 'x', description: 'y' } },
        at(2),
      ),
    );
    const refused = await saveStudyFile(path, mine, { expectedDiskHash: opened.diskHash });
    expect(refused.ok).toBe(false);
    expect(!refused.ok && refused.findings[0]).toMatchObject({
      file: path,
      message: expect.stringMatching(/changed on disk since it was opened/),
    });
    expect(readFileSync(path).equals(theirs)).toBe(true);
    expect(existsSync(`${path}.bak`)).toBe(false);
    // And a file deleted since opening is not silently recreated either.
    const gone = join(folder, 'gone.ledger');
    const refusedGone = await saveStudyFile(gone, mine, { expectedDiskHash: opened.diskHash });
    expect(!refusedGone.ok && refusedGone.findings[0].message).toMatch(/moved or deleted/);
    const exists = await saveStudyFile(path, mine, { expectedDiskHash: null });
    expect(!exists.ok && exists.findings[0].message).toMatch(/already exists/);
  });

  it('opens a file that fails its schema with the field named, and leaves it untouched', async () => {
    const path = join(folder, 'bad.ledger');
    const document = JSON.parse(formatStudy(sampleStudy()));
    document.identity.inspectionUnit = 7;
    const text = JSON.stringify(document);
    writeFileSync(path, text);
    const opened = await openStudyFile(path);
    expect(opened.ok).toBe(false);
    expect(!opened.ok && opened.findings[0]).toMatchObject({
      file: path,
      message: expect.stringMatching(/field "identity\.inspectionUnit"/),
    });
    expect(readFileSync(path, 'utf8')).toBe(text);
    const missing = await openStudyFile(join(folder, 'none.ledger'));
    expect(!missing.ok && missing.findings[0].message).toMatch(/cannot be read \(ENOENT/);
  });

  it('opens a broken chain read-only, names the event, refuses to save it, and a copy keeps the break', async () => {
    const path = join(folder, 'tampered.ledger');
    const study = value(
      exclude(
        sampleStudy(),
        { who: 'A. Tester', index: 4, cause: { category: 'Tooling', description: 'die' } },
        at(1),
      ),
    );
    value(await saveStudyFile(path, study, { expectedDiskHash: null }));
    const text = readFileSync(path, 'utf8').replace('"description":"die"', '"description":"operator"');
    writeFileSync(path, text);
    const opened = value(await openStudyFile(path));
    expect(opened.readOnly).toBe(true);
    expect(opened.problems.map((problem) => `${problem.code}@${problem.seq}`)).toEqual(['hash-mismatch@3']);
    expect(opened.problems[0].message).toMatch(/^event 3 \(excluded\) was changed after it was recorded/);

    const refused = await saveStudyFile(path, opened.study, { expectedDiskHash: opened.diskHash });
    expect(!refused.ok && refused.findings[0].message).toMatch(/not saved: .*saved as a copy/);
    expect(readFileSync(path, 'utf8')).toBe(text);

    const copy = join(folder, 'tampered copy.ledger');
    value(await saveStudyCopy(copy, opened.study));
    const reopened = value(await openStudyFile(copy));
    expect(reopened.readOnly).toBe(true);
    expect(reopened.problems).toEqual(opened.problems);
    const again = await saveStudyCopy(copy, opened.study);
    expect(!again.ok && again.findings[0].message).toMatch(/already exists/);
  });
});
