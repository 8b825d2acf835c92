import type { AuditEvent } from '../study/audit-event.js';
import type { AnalysisOptions } from '../study/analysis-types.js';

function methodInWords(method: AnalysisOptions): string {
  const limits =
    method.limits === 'probability'
      ? `probability limits (α ${method.fap !== undefined ? `from a Phase I false-alarm probability of ${method.fap}` : method.alpha})`
      : `${method.limits === 'laney' ? 'Laney u′' : 'sigma'} limits, L = ${method.multiplier}`;
  const chart = method.chart ? `${method.chart} chart, ` : '';
  const rate = method.knownRate !== undefined ? `, known rate ${method.knownRate}` : '';
  return `${chart}${limits}, rules ${method.rules.join(', ') || 'none'}${rate}`;
}

/** One audit event as the History screen lists it: what happened, in a few plain words. */
export function eventInWords(
  event: AuditEvent,
  events: readonly AuditEvent[] = [],
): { action: string; detail: string } {
  const target = (seq: number) => events.find((e) => e.seq === seq);
  switch (event.type) {
    case 'created':
      return { action: 'Study created', detail: event.payload.identity.part || event.payload.studyId };
    case 'imported':
      return {
        action: 'History imported',
        detail: `${event.payload.observationCount} periods from ${event.payload.file}`,
      };
    case 'excluded': {
      const { label, cause } = event.payload;
      return {
        action: 'Excluded',
        detail: `${label}: ${cause.category}: ${cause.description}${cause.reference ? ` (corrective action ${cause.reference})` : ''}`,
      };
    }
    case 'reinstated':
      return { action: 'Reinstated', detail: event.payload.label };
    case 'corrected':
      return {
        action: 'Corrected',
        detail: `${event.payload.label}, ${event.payload.field}: ${String(event.payload.original)} → ${String(event.payload.value)}`,
      };
    case 'method-changed':
      return {
        action: 'Method changed',
        detail: `${methodInWords(event.payload.from)} → ${methodInWords(event.payload.to)}`,
      };
    case 'note-added':
      return { action: 'Note', detail: `${event.payload.label}: ${event.payload.text}` };
    case 'undo': {
      const undone = target(event.payload.target);
      return {
        action: 'Undo',
        detail: `takes back entry ${event.payload.target}${undone ? ` (${eventInWords(undone).action.toLowerCase()})` : ''}`,
      };
    }
    case 'redo':
      return { action: 'Redo', detail: `takes back the undo in entry ${event.payload.target}` };
    case 'split-added':
      return {
        action: 'New segment',
        detail: `from ${event.payload.label}, with limits of its own: ${event.why}`,
      };
    case 'split-removed':
      return {
        action: 'Segments joined',
        detail: `${event.payload.label} no longer starts a segment${event.why ? `: ${event.why}` : ''}`,
      };
    case 'periods-added': {
      const { observationCount, file, firstIndex } = event.payload;
      return {
        action: 'Periods added',
        detail: `${observationCount} period${observationCount === 1 ? '' : 's'} from ${file}, from period ${firstIndex + 1} on`,
      };
    }
    case 'iteration':
      return {
        action: `Recompute ${event.payload.number}`,
        detail: `center ${event.payload.center}, ${event.payload.signals.length} signals, ${event.payload.excluded.length} excluded`,
      };
    case 'migrated':
      return {
        action: 'Migrated',
        detail: `schema ${event.payload.fromVersion} → ${event.payload.toVersion}`,
      };
    default: {
      const words: Record<string, string> = {
        'revision-drafted': 'Revision drafted',
        'revision-changed': 'Revision changed',
        'revision-approved': 'Revision approved',
        'revision-voided': 'Revision voided',
        signed: 'Signed',
      };
      const payload = (event as { payload?: Record<string, unknown> }).payload ?? {};
      const detail = Object.entries(payload)
        .filter(([, v]) => typeof v === 'string' || typeof v === 'number')
        .map(([k, v]) => `${k} ${String(v)}`)
        .join(', ');
      return { action: words[event.type] ?? event.type, detail };
    }
  }
}
