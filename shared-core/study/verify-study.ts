import { verifyChain } from './audit-chain.js';
import { canonicalJson } from './canonical-json.js';
import { importHash, observationsHash } from './new-study.js';
import { deriveState } from './study-state.js';
import type { EventOf } from './audit-event.js';
import type { Study } from './study-schema.js';
import type { StudyProblem } from './study-problem.js';

/**
 * Everything opening a study checks beyond its schema: the chain link by link (audit-chain.ts),
 * that the first event binds this study's id, that the observations and source are the ones the
 * import event recorded, that every decision can be applied, that the method is the chain's, and
 * that every revision's anchored chain head is still in the chain (so truncating a signed chain
 * shows even when the header was rewritten to match).
 */
export function verifyStudy(study: Study): StudyProblem[] {
  const problems = verifyChain(study);
  const first = study.events[0];
  if (first.type !== 'created' || first.payload.studyId !== study.id) {
    problems.push(
      error(
        'not-bound',
        first.seq,
        `event ${first.seq} does not create this study: the first event must bind the study id`,
      ),
    );
  }

  const imported = study.events
    .filter((event): event is EventOf<'imported'> => event.type === 'imported')
    .at(-1);
  if (!imported) {
    problems.push(error('import-mismatch', null, 'no import event records where the observations came from'));
  } else {
    const { payload, seq } = imported;
    const added = study.events.filter((e): e is EventOf<'periods-added'> => e.type === 'periods-added');
    const expected = added.reduce((n, e) => n + e.payload.observationCount, payload.observationCount);
    if (
      expected !== study.observations.length ||
      payload.observationsSha256 !== observationsHash(study.observations.slice(0, payload.observationCount))
    ) {
      problems.push(
        error(
          'import-mismatch',
          seq,
          `the observations differ from those imported in event ${seq}: they were changed outside the program`,
        ),
      );
    }
    let next = payload.observationCount;
    for (const event of added) {
      const { firstIndex, observationCount, observationsSha256 } = event.payload;
      const slice = study.observations.slice(firstIndex, firstIndex + observationCount);
      if (firstIndex !== next || observationsHash(slice) !== observationsSha256)
        problems.push(
          error(
            'import-mismatch',
            event.seq,
            `the periods added in event ${event.seq} differ from those it recorded: they were changed outside the program`,
          ),
        );
      next = firstIndex + observationCount;
    }
    if (payload.sourceSha256 !== study.source.sha256 || payload.file !== study.source.file) {
      problems.push(
        error('import-mismatch', seq, `the source file or its hash differs from what event ${seq} recorded`),
      );
    }
    if (payload.importSha256 !== importHash(study.source)) {
      problems.push(
        error('import-mismatch', seq, `the import settings or report differ from what event ${seq} recorded`),
      );
    }
  }

  const state = deriveState(study);
  problems.push(...state.problems);
  if (canonicalJson(state.method) !== canonicalJson(study.method)) {
    problems.push(
      error(
        'method-mismatch',
        null,
        'the method in the file is not the one its decisions lead to: it was changed outside the program',
      ),
    );
  }

  const heads = new Set(study.events.map((event) => event.hash));
  for (const revision of study.revisions) {
    if (!heads.has(revision.chainHead)) {
      const signed = revision.signOffs.length > 0 ? ` with ${revision.signOffs.length} sign-off(s)` : '';
      problems.push(
        error(
          'anchor-missing',
          null,
          `revision ${revision.number}${signed} is anchored at an event that is no longer in the chain: the chain was truncated or rewritten`,
        ),
      );
    }
  }
  return problems;
}

function error(code: StudyProblem['code'], seq: number | null, message: string): StudyProblem {
  return { level: 'error', code, seq, message };
}
