import { describe, expect, it } from 'vitest';
import { formatStudy, parseStudy } from '../../shared-core/study/study-text.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import { deriveState } from '../../shared-core/study/study-state.js';
import { fullStudy, sampleStudy } from '../integration/fixtures/study-sample.js';

describe('the study file text', () => {
  it('round-trips every field and gives the same bytes when written again', () => {
    const study = fullStudy();
    expect(verifyStudy(study)).toEqual([]);
    const text = formatStudy(study);
    const parsed = parseStudy(text);
    if (!parsed.ok) throw new Error(parsed.findings[0].message);
    expect(parsed.value.migratedFrom).toBeNull();
    expect(parsed.value.study).toEqual(JSON.parse(JSON.stringify(study)));
    expect(formatStudy(parsed.value.study)).toBe(text);
    expect(verifyStudy(parsed.value.study)).toEqual([]);
    expect(deriveState(parsed.value.study)).toEqual(deriveState(study));
    // Every kind of event the fixture makes is in the file.
    expect(new Set(parsed.value.study.events.map((event) => event.type))).toEqual(
      new Set([
        'created',
        'imported',
        'excluded',
        'reinstated',
        'corrected',
        'method-changed',
        'note-added',
        'undo',
        'redo',
        'iteration',
        'revision-drafted',
        'signed',
      ]),
    );
  });

  it('writes one observation and one event per line, so that a diff reads well', () => {
    const text = formatStudy(sampleStudy(5));
    const lines = text.split('\n');
    expect(lines.filter((line) => line.startsWith('    {"count":'))).toHaveLength(5);
    expect(lines.filter((line) => line.startsWith('    {"clock":"local"'))).toHaveLength(2);
    expect(text.endsWith('}\n')).toBe(true);
  });

  it('names the field that fails the schema', () => {
    const document = JSON.parse(formatStudy(sampleStudy()));
    document.events[1].time = 'yesterday';
    const parsed = parseStudy(JSON.stringify(document), 'line-4.ledger');
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) {
      expect(parsed.findings[0].file).toBe('line-4.ledger');
      expect(parsed.findings[0].message).toMatch(/^field "events\[1\]\.time": /);
    }
    document.events[1].time = sampleStudy().events[1].time;
    document.observations[2].count = -1;
    const negative = parseStudy(JSON.stringify(document));
    expect(!negative.ok && negative.findings[0].message).toMatch(/field "observations\[2\]\.count"/);
  });

  it('refuses text that is not JSON, has no schema version, or is from a newer version', () => {
    expect(parseStudy('{"schemaVersion": 1,').ok).toBe(false);
    const none = parseStudy('{"id": "x"}');
    expect(!none.ok && none.findings[0].message).toMatch(/schemaVersion/);
    const newer = parseStudy('{"schemaVersion": 7}');
    expect(!newer.ok && newer.findings[0].message).toMatch(/newer than this program reads/);
    const unknownField = JSON.parse(formatStudy(sampleStudy()));
    unknownField.extra = true;
    const strict = parseStudy(JSON.stringify(unknownField));
    expect(!strict.ok && strict.findings[0].message).toMatch(/extra/);
  });
});
