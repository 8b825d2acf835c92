import { study } from './study.svelte.js';
import { eventInWords } from '../../shared-core/view/event-in-words.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';

/** The History screen's search over the audit trail. */
class HistoryState {
  query = $state('');

  readonly entries = $derived.by(() => {
    const events = study.audit;
    return events.map((event) => ({ event, ...eventInWords(event, events) }));
  });

  readonly matches = $derived.by(() => {
    const words = this.query.trim().toLowerCase().split(/\s+/).filter(Boolean);
    if (words.length === 0) return this.entries;
    return this.entries.filter((entry) => {
      const text =
        `${entry.event.seq} ${entry.action} ${entry.detail} ${entry.event.who} ${entry.event.why ?? ''} ${entry.event.time}`.toLowerCase();
      return words.every((word) => text.includes(word));
    });
  });

  /** The document's own check: chain links, binding, import hashes, anchors of sign-offs. */
  readonly problems = $derived(study.document ? verifyStudy(study.document) : []);
}

export const history = new HistoryState();
