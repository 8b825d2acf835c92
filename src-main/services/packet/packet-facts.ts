import type { LimitsRow } from './limits-table.js';

/**
 * What the PDF states, in machine-readable form: embedded in the PDF next to the study (so it is
 * inside the signed range) and printed in words on its pages. `verify` compares it with a fresh
 * recomputation and with the workbook.
 */
export interface PacketFacts {
  format: 'limit-ledger-packet-facts';
  version: 1;
  studyId: string;
  revision: number;
  chart: 'c' | 'u';
  limits: 'sigma' | 'probability' | 'laney';
  center: number;
  rate: number;
  table: LimitsRow[];
  /** Each period's limits, in period order, as the data table prints them. */
  periods: { label: string; lcl: number | null; ucl: number; status: string }[];
  /** SHA-256 of the embedded study document's bytes. */
  studySha256: string | null;
  /** SHA-256 of the workbook exported with this PDF. */
  workbookSha256: string | null;
  generatedAt: string;
}

export const factsFileName = 'packet-facts.json';
