import { fail, ok, type Result } from '../result.js';
import type { AnalysisResult, RuleId, Warning } from '../study/analysis-types.js';
import {
  averageRunLength,
  defaultShifts,
  limitsAtUnits,
  type AverageRunLength,
} from './average-run-length.js';
import { changePoint, type ChangePoint, type ChangePointOptions } from './change-point.js';
import { rateRatioTest, type RateRatioTest } from './rate-ratio-test.js';

/** Center and limits at one k, on the plotted scale (rate for a u chart, count for a c chart). */
export interface LimitsAt {
  center: number;
  lcl: number | null;
  ucl: number;
}

export interface LimitsComparison {
  units: number;
  approved: LimitsAt;
  proposed: LimitsAt;
  /** The proposed UCL is above the approved one at this k: a worse rate would pass unsignalled. */
  wider: boolean;
}

export interface ChangeEvidence {
  comparison: RateRatioTest;
  limits: LimitsComparison[];
  /** Any k where the proposed limits are wider: the change needs extra scrutiny. */
  wider: boolean;
  arl: { approved: AverageRunLength; proposed: AverageRunLength; units: number } | null;
  /** Why no run lengths are given (a rule the exact chain cannot follow), when so. */
  arlNote: string | null;
  /** One step over the approved periods followed by the proposed ones; labels of the split. */
  changePoint: (ChangePoint & { lastBefore: string; firstAfter: string }) | null;
  warnings: Warning[];
}

export interface ChangeEvidenceInput {
  approved: AnalysisResult;
  approvedRules: readonly RuleId[];
  proposed: AnalysisResult;
  proposedRules: readonly RuleId[];
  shifts?: readonly number[];
  changePoint?: ChangePointOptions;
}

/** Over-dispersion at this level in either study makes the exact rate test optimistic. */
const DISPERSION_LEVEL = 0.01;

function limitsOf(result: AnalysisResult, units: number): LimitsAt {
  const { limits } = limitsAtUnits(result, units);
  const scale = result.chart === 'c' ? 1 : 1 / units;
  return {
    center: result.rate * units * scale,
    lcl: limits.lower === null ? null : limits.lower * scale,
    ucl: limits.upper * scale,
  };
}

/** The smallest, mean and largest k of the proposed study's included periods (without repeats). */
export function typicalUnitsList(result: AnalysisResult): number[] {
  const units = result.periods.filter((p) => p.status !== 'excluded').map((p) => p.units);
  const mean = result.totals.units / result.m;
  return [...new Set([Math.min(...units), mean, Math.max(...units)])].sort((a, b) => a - b);
}

/**
 * What a manager needs to decide a change of limits, from the approved and the proposed analyses:
 * the exact rate ratio proposed/approved with its interval and test (over the included periods of
 * each), old against new center and limits at typical k with a flag where the new ones are wider,
 * the average run lengths of both at the mean k, and a check for one step over the approved
 * periods followed by the proposed ones. Sources: see rate-ratio-test.ts, average-run-length.ts
 * and change-point.ts.
 */
export function changeEvidence(input: ChangeEvidenceInput): Result<ChangeEvidence> {
  const { approved, proposed } = input;
  const overdispersed = [approved, proposed].some(
    (r) => r.dispersion.pOver < DISPERSION_LEVEL || (r.sigmaZ !== null && r.sigmaZ > 1),
  );
  const comparison = rateRatioTest(approved.totals, proposed.totals, { overdispersed });
  if (!comparison.ok) return comparison;

  const limits = typicalUnitsList(proposed).map((units): LimitsComparison => {
    const before = limitsOf(approved, units);
    const after = limitsOf(proposed, units);
    // A higher UCL lets a worse rate pass unsignalled; a lower LCL only hides an improvement.
    return { units, approved: before, proposed: after, wider: after.ucl > before.ucl };
  });

  const units = proposed.totals.units / proposed.m;
  const shifts = input.shifts ?? defaultShifts;
  const approvedArl = averageRunLength(limitsAtUnits(approved, units), input.approvedRules, shifts);
  const proposedArl = averageRunLength(limitsAtUnits(proposed, units), input.proposedRules, shifts);
  const arl =
    approvedArl.ok && proposedArl.ok
      ? { approved: approvedArl.value, proposed: proposedArl.value, units }
      : null;
  const arlNote = approvedArl.ok
    ? proposedArl.ok
      ? null
      : proposedArl.findings[0].message
    : approvedArl.findings[0].message;

  const history = [approved, proposed].flatMap((r) => r.periods.filter((p) => p.status !== 'excluded'));
  let step: ChangeEvidence['changePoint'] = null;
  if (history.length >= 3) {
    const found = changePoint(history, input.changePoint);
    if (!found.ok) return fail(...found.findings);
    step = {
      ...found.value,
      lastBefore: history[found.value.splitAfter].label,
      firstAfter: history[found.value.splitAfter + 1].label,
    };
  }

  const warnings: Warning[] = [...comparison.value.cautions];
  if (limits.some((l) => l.wider))
    warnings.push({
      code: 'wider-limits',
      message:
        'the proposed limits are wider than the approved ones at some k: a wider limit lets a worse process pass unsignalled, so the change needs extra scrutiny',
    });
  return ok({
    comparison: comparison.value,
    limits,
    wider: limits.some((l) => l.wider),
    arl,
    arlNote,
    changePoint: step,
    warnings,
  });
}
