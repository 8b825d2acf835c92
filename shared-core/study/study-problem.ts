/**
 * Something wrong with a study document found on open: which event (by seq, as the History screen
 * numbers them) and what. Errors make the study read-only; warnings are shown and kept.
 */
export interface StudyProblem {
  level: 'error' | 'warning';
  code:
    | 'hash-mismatch'
    | 'broken-link'
    | 'missing-event'
    | 'reordered'
    | 'duplicate-event'
    | 'time-backwards'
    | 'truncated'
    | 'header-mismatch'
    | 'content-mismatch'
    | 'not-bound'
    | 'import-mismatch'
    | 'invalid-decision'
    | 'method-mismatch'
    | 'anchor-missing';
  /** The event concerned; null for the header or the document as a whole. */
  seq: number | null;
  message: string;
}

export const hasErrors = (problems: readonly StudyProblem[]): boolean =>
  problems.some((problem) => problem.level === 'error');
