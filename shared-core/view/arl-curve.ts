import { averageRunLength, type LimitsAtUnits } from '../changes/average-run-length.js';
import { ok, type Result } from '../result.js';
import type { RuleId } from '../study/analysis-types.js';
import { palette } from './palette.js';

/**
 * The run-length curve of a limit change: the average run length (ARL) of the approved and the
 * proposed limits when the process runs at a given rate, the rate given as a multiple of the
 * approved rate (the same ratio the evidence's rate test reports). The approved limits are in
 * control at 1, the proposed ones at the observed ratio, so a manager sees how long each set takes
 * to raise an alarm at any rate, including the rate the process now runs at.
 */

export interface ArlCurve {
  /** The rate as a multiple of the approved rate, ascending. */
  ratios: number[];
  approved: (number | null)[];
  proposed: (number | null)[];
  /** The proposed rate over the approved rate (where the proposed limits are in control). */
  proposedRatio: number;
}

/** Evenly spaced on a log scale from `low` to `high`, with 1 and `extra` included. */
export function curveRatios(
  low: number,
  high: number,
  count: number,
  extra: readonly number[] = [],
): number[] {
  const step = (Math.log(high) - Math.log(low)) / (count - 1);
  const grid = Array.from({ length: count }, (_, i) => Math.exp(Math.log(low) + i * step));
  return [...new Set([...grid, 1, ...extra].map((r) => Number(r.toPrecision(12))))].sort((a, b) => a - b);
}

/**
 * ARL of both limit sets over ratios from ¾ of the lower in-control rate to three times the higher
 * one (both at the same k), from `averageRunLength` (exact Poisson; Markov chain for rule sets).
 */
export function arlCurve(
  approved: { at: LimitsAtUnits; rules: readonly RuleId[] },
  proposed: { at: LimitsAtUnits; rules: readonly RuleId[] },
  points = 41,
): Result<ArlCurve> {
  const proposedRatio = proposed.at.rate / approved.at.rate;
  const ratios = curveRatios(Math.min(1, proposedRatio) * 0.75, Math.max(1, proposedRatio) * 3, points, [
    proposedRatio,
  ]);
  const before = averageRunLength(approved.at, approved.rules, ratios);
  if (!before.ok) return before;
  const after = averageRunLength(
    proposed.at,
    proposed.rules,
    ratios.map((r) => r / proposedRatio),
  );
  if (!after.ok) return after;
  // averageRunLength puts the in-control point first, then the shifts without 1: index by shift.
  const byShift = (points: { shift: number; arl: number | null }[]) =>
    new Map(points.map((p) => [p.shift, p.arl]));
  const a = byShift(before.value.points);
  const b = byShift(after.value.points);
  return ok({
    ratios,
    approved: ratios.map((r) => a.get(r) ?? null),
    proposed: ratios.map((r) => b.get(r / proposedRatio) ?? null),
    proposedRatio,
  });
}

/** Run lengths above this are off the plot (a gap in the line): a million periods is "never" in practice. */
export const maxShownArl = 1e6;

/** 1, 10, 100, 1k, 10k, 100k, 1M: short enough for the axis. */
export function decadeLabel(value: number): string {
  return value >= 1e6 ? `${value / 1e6}M` : value >= 1e3 ? `${value / 1e3}k` : String(value);
}

export interface CurveLayout {
  width: number;
  height: number;
  margin: { left: number; right: number; top: number; bottom: number };
  /** The decades of the log y axis, e.g. 1, 10, 100, 1000. */
  decades: number[];
  /** The top of the y axis: longer run lengths are left out of the line. */
  high: number;
  x(ratio: number): number;
  y(arl: number): number;
}

/** Where ratios and run lengths go on the plot: x linear in the ratio, y in log₁₀(ARL). */
export function curveLayout(curve: ArlCurve, size = { width: 560, height: 300 }): CurveLayout {
  const margin = { left: 60, right: 16, top: 28, bottom: 44 };
  const finite = [...curve.approved, ...curve.proposed].filter((v): v is number => v !== null && v > 0);
  const top = Math.max(10, ...finite);
  const high = Math.min(10 ** Math.ceil(Math.log10(top)), maxShownArl);
  const decades: number[] = [];
  for (let d = 1; d <= high; d *= 10) decades.push(d);
  const lowX = curve.ratios[0];
  const highX = curve.ratios[curve.ratios.length - 1];
  const plotWidth = size.width - margin.left - margin.right;
  const plotHeight = size.height - margin.top - margin.bottom;
  return {
    ...size,
    margin,
    decades,
    high,
    x: (ratio) => margin.left + ((ratio - lowX) / (highX - lowX)) * plotWidth,
    y: (arl) =>
      margin.top + (1 - Math.log10(Math.min(Math.max(arl, 1), high)) / Math.log10(high)) * plotHeight,
  };
}

function escapeXml(text: string): string {
  return text.replace(
    /[<>&"']/g,
    (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!,
  );
}

/**
 * The curve as an SVG: approved limits dashed slate, proposed solid teal, log y axis by decades,
 * vertical guides where each set is in control. An infinite ARL (no count can signal) or one beyond
 * a million periods leaves a gap.
 */
export function arlCurveSvg(
  curve: ArlCurve,
  text: { xTitle: string; title: string },
  size?: { width: number; height: number },
): string {
  const layout = curveLayout(curve, size);
  const { margin, width, height, x, y } = layout;
  const f = (n: number) => n.toFixed(1);
  const path = (values: (number | null)[]) => {
    const runs: string[] = [];
    let current: string[] = [];
    values.forEach((v, i) => {
      if (v === null || v > layout.high) {
        if (current.length > 1) runs.push(current.join(' '));
        current = [];
      } else current.push(`${f(x(curve.ratios[i]))},${f(y(v))}`);
    });
    if (current.length > 1) runs.push(current.join(' '));
    return runs;
  };
  const line = (values: (number | null)[], color: string, dash: string, name: string) =>
    path(values)
      .map(
        (points) =>
          `<polyline data-curve="${name}" points="${points}" fill="none" stroke="${color}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`,
      )
      .join('');
  const yTicks = layout.decades
    .map((d) => {
      const ty = f(y(d));
      return (
        `<line x1="${margin.left}" x2="${width - margin.right}" y1="${ty}" y2="${ty}" stroke="${palette.grid}"/>` +
        `<text x="${margin.left - 6}" y="${ty}" text-anchor="end" dominant-baseline="middle">${decadeLabel(d)}</text>`
      );
    })
    .join('');
  const lowX = curve.ratios[0];
  const highX = curve.ratios[curve.ratios.length - 1];
  const xStep = highX - lowX > 4 ? 1 : 0.5;
  const xTicks: string[] = [];
  for (let t = Math.ceil(lowX / xStep) * xStep; t <= highX + 1e-9; t += xStep)
    xTicks.push(
      `<text x="${f(x(t))}" y="${height - margin.bottom + 16}" text-anchor="middle">${Number(t.toFixed(2))}</text>`,
    );
  // Each guide's label to the right of it, at its own height, so that close guides do not collide.
  const guide = (ratio: number, color: string, label: string, row: number) =>
    `<line x1="${f(x(ratio))}" x2="${f(x(ratio))}" y1="${margin.top}" y2="${height - margin.bottom}" stroke="${color}" stroke-width="1" stroke-dasharray="2 3"/>` +
    `<text x="${f(x(ratio) + 4)}" y="${margin.top + 12 + 14 * row}" fill="${color}">${escapeXml(label)}</text>`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="DejaVu Sans, sans-serif" font-size="11" fill="${palette.ink}">`,
    `<rect width="100%" height="100%" fill="${palette.background}"/>`,
    `<text x="${margin.left}" y="16" font-size="12" font-weight="bold">${escapeXml(text.title)}</text>`,
    `<text transform="translate(14 ${margin.top + (height - margin.top - margin.bottom) / 2}) rotate(-90)" text-anchor="middle">periods to a signal (log scale)</text>`,
    `<text x="${margin.left + (width - margin.left - margin.right) / 2}" y="${height - 8}" text-anchor="middle">${escapeXml(text.xTitle)}</text>`,
    yTicks,
    ...xTicks,
    guide(1, palette.center, 'approved rate', 1),
    guide(curve.proposedRatio, palette.limit, 'new rate', 0),
    line(curve.approved, palette.center, '7 4', 'approved'),
    line(curve.proposed, palette.limit, '', 'proposed'),
    '</svg>',
  ].join('');
}
