import type {
  AnalysisOptions,
  AnalysisResult,
  AssignableCause,
  Iteration,
} from '../../../shared-core/study/analysis-types.js';
import type { ChangeEvidence } from '../../../shared-core/changes/change-evidence.js';
import type { ReasonCategory } from '../../../shared-core/study/revision-schema.js';
import type { ArlCurve } from '../../../shared-core/view/arl-curve.js';

/** How a sign-off stands when the packet is made (see sign-off checks). */
export type SignOffState = 'valid' | 'void' | 'invalid';

export interface SignOffLine {
  printedName: string;
  role: string;
  meaning: 'prepared' | 'reviewed' | 'approved';
  /** ISO date-time with its zone offset, as recorded. */
  time: string;
  fingerprint: string;
  selfIssued: boolean;
  state: SignOffState;
  /** Why a sign-off is void or invalid, in words. */
  note?: string;
}

export interface ExclusionLine {
  label: string;
  cause: AssignableCause;
  who: string;
  when: string;
}

/** What an approval packet shows: everything is already computed; the writers only lay it out. */
export interface PacketContent {
  studyId: string;
  title: string;
  identity: {
    part: string;
    processStep: string;
    characteristic: string;
    inspectionUnit: string;
    owner: string;
    site?: string;
    demo?: boolean;
  };
  source: { file: string; sha256: string };
  revision: {
    number: number;
    status: string;
    effectiveDate?: string;
    reviewDate?: string;
    reactionPlan?: string;
  };
  options: AnalysisOptions;
  result: AnalysisResult;
  iterations: Iteration[];
  exclusions: ExclusionLine[];
  signOffs: SignOffLine[];
  /** The audit events in words, oldest first. */
  audit: { seq: number; time: string; who: string; what: string; hash: string }[];
  /** ISO date-time with zone of when the packet is made. */
  generatedAt: string;
  /** Present when the revision supersedes an approved one: the packet is a change packet. */
  change?: ChangeContent;
  /** The study document, embedded in the PDF so that the packet alone is the whole record. */
  studyDocument?: { fileName: string; bytes: Uint8Array };
}

/** The approved revision a change replaces, as it was frozen. */
export interface SupersededRevision {
  id: string;
  number: number;
  effectiveDate?: string;
  reviewDate?: string;
  options: AnalysisOptions;
  /** Its analysis recomputed at its anchor (and checked against the center it signed). */
  result: AnalysisResult;
  signOffs: SignOffLine[];
}

/** What a change packet adds: why the limits change, what they replace and the evidence for it. */
export interface ChangeContent {
  reasonCategory?: ReasonCategory;
  /** The category in words (revision-schema's reasonForChangeList). */
  reasonWords?: string;
  reason: string;
  approved: SupersededRevision;
  evidence: ChangeEvidence;
  /** Run lengths of both sets over a range of rates, for the curve; null when the rules forbid. */
  arlCurve: ArlCurve | null;
}
