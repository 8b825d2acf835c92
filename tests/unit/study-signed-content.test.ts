import { describe, expect, it } from 'vitest';
import { appendEvent, sealStudy } from '../../shared-core/study/audit-chain.js';
import { canonicalJson } from '../../shared-core/study/canonical-json.js';
import { signOffBytes, signedContent, signedContentBytes } from '../../shared-core/study/signed-content.js';
import { exclude } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { at, fullStudy } from '../integration/fixtures/study-sample.js';

const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

describe('the signed content of a revision', () => {
  const study = fullStudy();
  const revision = study.revisions[0];

  it('holds the parts DESIGN.md lists, as canonical JSON', () => {
    const content = signedContent(study, revision);
    expect(content.studyId).toBe(study.id);
    expect(content.observations).toEqual(study.observations);
    expect(content.correctedObservations[2].count).toBe(9);
    expect(content.source.sha256).toBe(study.source.sha256);
    expect(content.importSettings).toEqual(study.source.importSettings);
    expect(content.method).toEqual(revision.method);
    expect(content.exclusions).toEqual([
      { index: 3, label: 'L004', cause: { category: 'Material', description: 'wet lot', reference: 'CA-1' } },
    ]);
    expect(content.corrections.map((c) => c.reason)).toEqual(['transposed digits', 'date missing']);
    expect(content.results).toEqual({ center: revision.center, limits: revision.limits });
    expect(content.chainHead).toBe(revision.chainHead);
    expect(content.revision).not.toHaveProperty('signOffs');
    expect(decode(signedContentBytes(study, revision))).toBe(canonicalJson(content));
  });

  it('does not change with decisions made after the anchored head, or with approval', () => {
    const before = decode(signedContentBytes(study, revision));
    const later = exclude(
      study,
      { who: 'A. Tester', index: 8, cause: { category: 'x', description: 'y' } },
      at(30),
    );
    if (!later.ok) throw new Error('setup');
    expect(decode(signedContentBytes(later.value, revision))).toBe(before);
    expect(decode(signedContentBytes(study, { ...revision, status: 'void' }))).toBe(before);
  });

  it('changes when anything it covers changes', () => {
    const before = decode(signedContentBytes(study, revision));
    const edits: ((s: Study) => void)[] = [
      (s) => (s.observations[0].count += 1),
      (s) => (s.source.sha256 = 'd'.repeat(64)),
      (s) => (s.source.importSettings.delimiter = ';'),
      (s) => (s.id = 'other'),
      (s) =>
        ((s.events[2] as { payload: { cause: { description: string } } }).payload.cause.description =
          'dry lot'),
    ];
    for (const edit of edits) {
      const changed = structuredClone(study);
      edit(changed);
      expect(decode(signedContentBytes(changed, changed.revisions[0]))).not.toBe(before);
    }
    expect(decode(signedContentBytes(study, { ...revision, center: 0.31 }))).not.toBe(before);
    expect(decode(signedContentBytes(study, { ...revision, reactionPlan: 'call QA' }))).not.toBe(before);
  });

  it('a sign-off covers its own fields and the sign-offs before it', () => {
    const first = revision.signOffs[0];
    const { signature: _s, ...second } = {
      ...first,
      printedName: 'C. Approver',
      fingerprint: 'e'.repeat(64),
      time: '2026-03-14T12:00:00.000+02:00',
    };
    const bytes = JSON.parse(decode(signOffBytes(study, revision, second)));
    expect(bytes.earlierSignOffs).toEqual([first]);
    expect(bytes.signOff).toEqual(second);
    expect(JSON.parse(decode(signOffBytes(study, revision, first))).earlierSignOffs).toEqual([]);
    const resealed: Study = appendEvent(
      sealStudy(study),
      { type: 'signed', who: 'C. Approver', payload: { revisionId: 'r1' } },
      at(40),
    );
    expect(decode(signOffBytes(resealed, revision, second))).toBe(
      decode(signOffBytes(study, revision, second)),
    );
  });
});
