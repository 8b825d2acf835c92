import type { AnalysisResult, PeriodResult } from '../study/analysis-types.js';
import { steppedLine, type ChartSeries } from './chart-series.js';
import { chartSvg } from './chart-svg.js';
import { palette } from './palette.js';

/**
 * The before/after chart of a limit change: the approved periods on the approved limits, then the
 * proposed study's periods on the proposed limits, on one axis. Counts are plotted when both are c
 * charts at the same k; otherwise rates, with a c chart's values divided by its k, so both halves
 * share a scale.
 */

export interface BeforeAfter {
  series: ChartSeries;
  labels: string[];
  /** How many periods the approved half has: the divider sits after that many. */
  approvedCount: number;
}

function sameCountScale(approved: AnalysisResult, proposed: AnalysisResult): boolean {
  if (approved.chart !== 'c' || proposed.chart !== 'c') return false;
  const units = new Set([...approved.periods, ...proposed.periods].map((p) => p.units));
  return units.size === 1;
}

export function beforeAfterSeries(approved: AnalysisResult, proposed: AnalysisResult): BeforeAfter {
  const counts = sameCountScale(approved, proposed);
  const periods: { period: PeriodResult; chart: 'c' | 'u' }[] = [
    ...approved.periods.map((period) => ({ period, chart: approved.chart })),
    ...proposed.periods.map((period) => ({ period, chart: proposed.chart })),
  ];
  // A c chart's center and limits are counts at its k; on the rate scale they are divided by k.
  const scaled = (value: number | null, p: PeriodResult, chart: 'c' | 'u') =>
    value === null ? null : counts || chart === 'u' ? value : value / p.units;
  return {
    series: {
      scale: counts ? 'count' : 'rate',
      points: periods.map(({ period }, i) => ({
        x: i + 1,
        y: counts ? period.count : period.rate,
        position: i,
        status: period.status,
      })),
      center: steppedLine(periods.map(({ period, chart }) => scaled(period.center, period, chart))),
      upper: steppedLine(periods.map(({ period, chart }) => scaled(period.ucl, period, chart))),
      lower: steppedLine(periods.map(({ period, chart }) => scaled(period.lcl, period, chart))),
    },
    labels: periods.map(({ period }) => period.label),
    approvedCount: approved.periods.length,
  };
}

/** chartSvg's plot margins (chart-svg.ts): the divider is placed on the same x scale. */
const plotMargin = { left: 64, right: 16, top: 36, bottom: 40 };

/**
 * The before/after chart as an SVG: chartSvg's marks and stepped lines, with a dotted divider
 * between the approved and the proposed periods, each half named above the plot.
 */
export function beforeAfterSvg(
  chart: BeforeAfter,
  text: { title: string; yTitle: string },
  size = { width: 960, height: 360 },
): string {
  const body = chartSvg(chart.series, { ...text, labels: chart.labels }, size);
  const count = chart.series.points.length;
  const plotWidth = size.width - plotMargin.left - plotMargin.right;
  const x = plotMargin.left + (chart.approvedCount / Math.max(1, count)) * plotWidth;
  const top = plotMargin.top;
  const bottom = size.height - plotMargin.bottom;
  const divider =
    `<line data-divider="true" x1="${x.toFixed(2)}" x2="${x.toFixed(2)}" y1="${top - 12}" y2="${bottom}" stroke="${palette.center}" stroke-width="1.5" stroke-dasharray="2 3"/>` +
    `<text x="${(x - 6).toFixed(2)}" y="${top - 2}" text-anchor="end" fill="${palette.center}">approved limits</text>` +
    `<text x="${(x + 6).toFixed(2)}" y="${top - 2}" text-anchor="start" fill="${palette.limit}">proposed limits</text>`;
  return body.replace(/<\/svg>$/, `${divider}</svg>`);
}
