import { canonicalJson } from './canonical-json.js';
import { sha256Hex } from './sha256.js';
import type { AuditEvent, EventDraft } from './audit-event.js';
import type { Study, StudyHeader } from './study-schema.js';
import type { StudyProblem } from './study-problem.js';

/**
 * The audit chain: every event carries the hash of the one before it, so a changed, removed or
 * reordered event breaks the chain where it happened.
 *
 *   prev₁ = SHA-256(JCS({ study: id })),  prevₙ = hashₙ₋₁,  hashₙ = SHA-256(JCS(eventₙ without hash))
 *
 * JCS is RFC 8785 canonical JSON (canonical-json.ts). The header seals the chain's length and head.
 */

/** What the first event links to: the study id, so a chain cannot be moved to another study. */
export function genesisHash(studyId: string): string {
  return sha256Hex(canonicalJson({ study: studyId }));
}

/** The hash of an event: everything it records except the hash itself. */
export function eventHash(event: Omit<AuditEvent, 'hash'> | AuditEvent): string {
  const { hash: _hash, ...content } = event as AuditEvent;
  return sha256Hex(canonicalJson(content));
}

/** The head of the chain: the last event's hash (the genesis hash of an empty chain). */
export function chainHead(study: Pick<Study, 'id' | 'events'>): string {
  const last = study.events.at(-1);
  return last ? last.hash : genesisHash(study.id);
}

/**
 * Hash of the document's parts outside the chain; observations are left out because the `imported`
 * event binds them (and hashing them on every click would be slow for large studies).
 */
export function contentHash(study: Omit<Study, 'header'>): string {
  const { schemaVersion, id, identity, source, method, revisions, siteSettings } = study;
  return sha256Hex(canonicalJson({ schemaVersion, id, identity, source, method, revisions, siteSettings }));
}

export function headerHash(header: Omit<StudyHeader, 'hash'>, studyId: string): string {
  const { eventCount, chainHead, contentHash } = header;
  return sha256Hex(canonicalJson({ study: studyId, eventCount, chainHead, contentHash }));
}

/** The header for the study as it is now. */
export function sealHeader(study: Omit<Study, 'header'>): StudyHeader {
  const unsealed = {
    eventCount: study.events.length,
    chainHead: chainHead(study),
    contentHash: contentHash(study),
  };
  return { ...unsealed, hash: headerHash(unsealed, study.id) };
}

/** The study with its header recomputed: call after changing identity, method, revisions or settings. */
export function sealStudy(study: Omit<Study, 'header'> & { header?: StudyHeader }): Study {
  return { ...study, header: sealHeader(study) } as Study;
}

/**
 * Appends one event and reseals the header; returns a new study (the argument is not changed).
 * `now` is the local clock's reading with its offset (local-time.ts). A clock that went backwards
 * is recorded as it read and flagged by verifyChain, never refused: the decision still happened.
 */
export function appendEvent(study: Study, draft: EventDraft, now: string): Study {
  // A copy, so that later changes to objects the caller still holds cannot reach the record.
  const linked = {
    ...(JSON.parse(JSON.stringify(draft)) as EventDraft),
    seq: study.events.length + 1,
    time: now,
    clock: 'local' as const,
    prev: chainHead(study),
  };
  const event = { ...linked, hash: eventHash(linked as Omit<AuditEvent, 'hash'>) } as AuditEvent;
  return sealStudy({ ...study, events: [...study.events, event] });
}

/**
 * Checks the chain link by link and the header: says exactly which event is broken and how.
 * Time going backwards is a warning (the local clock may have been set back); everything else is
 * an error.
 */
export function verifyChain(study: Study): StudyProblem[] {
  const problems: StudyProblem[] = [];
  const { events, header } = study;
  const storedHash = new Map<number, string>();
  for (const event of events) if (!storedHash.has(event.seq)) storedHash.set(event.seq, event.hash);
  const typeOf = new Map(events.map((event) => [event.seq, event.type]));
  const seen = new Set<number>();

  let previousSeq = 0;
  let previousTime: number | null = null;
  events.forEach((event, position) => {
    const name = `event ${event.seq} (${event.type})`;
    if (eventHash(event) !== event.hash) {
      problems.push(
        error(
          'hash-mismatch',
          event.seq,
          `${name} was changed after it was recorded: its content no longer matches its hash`,
        ),
      );
    }
    const expectedSeq = previousSeq + 1;
    if (seen.has(event.seq)) {
      problems.push(error('duplicate-event', event.seq, `event ${event.seq} appears twice`));
    } else if (event.seq < expectedSeq) {
      problems.push(
        error('reordered', event.seq, `${name} is out of order: it comes after event ${previousSeq}`),
      );
    } else if (event.seq > expectedSeq) {
      const later = events
        .slice(position + 1)
        .some((other) => other.seq >= expectedSeq && other.seq < event.seq);
      if (later) {
        problems.push(
          error('reordered', event.seq, `${name} is out of order: it comes before event ${expectedSeq}`),
        );
      } else {
        const missing =
          expectedSeq === event.seq - 1
            ? `event ${expectedSeq} is`
            : `events ${expectedSeq}–${event.seq - 1} are`;
        problems.push(
          error('missing-event', event.seq, `${missing} missing from the chain (before event ${event.seq})`),
        );
      }
    }
    if (event.seq === 1) {
      if (event.prev !== genesisHash(study.id)) {
        problems.push(
          error(
            'not-bound',
            1,
            `${name} is not bound to this study's id: the chain belongs to another study or the id was changed`,
          ),
        );
      }
    } else {
      // The link is checked against the event numbered one less, wherever it stands, so that a
      // reordering is reported once, as a reordering.
      const before = storedHash.get(event.seq - 1);
      if (before !== undefined && event.prev !== before) {
        const replaced = `event ${event.seq - 1} (${typeOf.get(event.seq - 1)})`;
        problems.push(
          error(
            'broken-link',
            event.seq - 1,
            `${replaced} was replaced: event ${event.seq} recorded a different hash for it`,
          ),
        );
      }
    }
    seen.add(event.seq);
    previousSeq = Math.max(previousSeq, event.seq);

    const time = Date.parse(event.time);
    if (previousTime !== null && time < previousTime) {
      problems.push({
        level: 'warning',
        code: 'time-backwards',
        seq: event.seq,
        message: `${name} is dated ${event.time}, earlier than an event before it: the local clock went backwards`,
      });
    }
    if (!Number.isNaN(time)) previousTime = Math.max(previousTime ?? time, time);
  });

  if (header.eventCount !== events.length) {
    const message =
      header.eventCount > events.length
        ? `the header records ${header.eventCount} events but the file holds ${events.length}: the chain was truncated (events ${events.length + 1}–${header.eventCount} are gone)`
        : `the header records ${header.eventCount} events but the file holds ${events.length}: events were added outside the program`;
    problems.push(error('truncated', null, message));
  } else if (header.chainHead !== chainHead(study)) {
    problems.push(
      error('header-mismatch', null, 'the chain head recorded in the header does not match the last event'),
    );
  }
  if (header.hash !== headerHash(header, study.id)) {
    problems.push(error('header-mismatch', null, 'the header was changed: its seal does not match'));
  }
  if (header.contentHash !== contentHash(study)) {
    problems.push(
      error(
        'content-mismatch',
        null,
        'the study identity, source, method, revisions or settings were changed outside the program',
      ),
    );
  }
  return problems;
}

function error(code: StudyProblem['code'], seq: number | null, message: string): StudyProblem {
  return { level: 'error', code, seq, message };
}
