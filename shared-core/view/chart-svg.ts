import type { ChartSeries, StepVertex } from './chart-series.js';
import { palette } from './palette.js';

function escapeXml(text: string): string {
  return text.replace(
    /[<>&"']/g,
    (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!,
  );
}

/** Round to a "nice" step (1, 2 or 5 times a power of ten) for axis ticks. */
function niceStep(span: number, ticks: number): number {
  const raw = span / Math.max(1, ticks);
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  return (fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10) * power;
}

/**
 * The chart as a standalone SVG document: stepped limits (broken where there is no LCL), the
 * center line, and every period with its mark (dot, triangle, crossed square).
 */
export function chartSvg(
  series: ChartSeries,
  text: { title: string; yTitle: string; labels: string[] },
  size = { width: 960, height: 420 },
): string {
  const margin = { left: 64, right: 16, top: 36, bottom: 40 };
  const plotWidth = size.width - margin.left - margin.right;
  const plotHeight = size.height - margin.top - margin.bottom;
  const values = [
    ...series.points.map((p) => p.y),
    ...[...series.upper, ...series.lower, ...series.center].flatMap((v) => (v.y === null ? [] : [v.y])),
  ];
  let low = Math.min(...values);
  let high = Math.max(...values);
  if (!(high > low)) high = low + 1;
  const pad = (high - low) * 0.06;
  low -= pad;
  high += pad;
  const count = series.points.length;
  const x = (value: number) => margin.left + ((value - 0.5) / Math.max(1, count)) * plotWidth;
  const y = (value: number) => margin.top + (1 - (value - low) / (high - low)) * plotHeight;
  const f = (n: number) => n.toFixed(2);

  const line = (vertices: StepVertex[], color: string, dash: string) => {
    const runs: string[] = [];
    let current: string[] = [];
    for (const vertex of vertices) {
      if (vertex.y === null) {
        if (current.length > 1) runs.push(current.join(' '));
        current = [];
      } else current.push(`${f(x(vertex.x))},${f(y(vertex.y))}`);
    }
    if (current.length > 1) runs.push(current.join(' '));
    return runs
      .map(
        (points) =>
          `<polyline points="${points}" fill="none" stroke="${color}" stroke-width="1.5"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`,
      )
      .join('');
  };

  const step = niceStep(high - low, 6);
  const ticks: string[] = [];
  for (let t = Math.ceil(low / step) * step; t <= high; t += step) {
    const ty = f(y(t));
    ticks.push(
      `<line x1="${margin.left}" x2="${size.width - margin.right}" y1="${ty}" y2="${ty}" stroke="${palette.grid}"/>` +
        `<text x="${margin.left - 6}" y="${ty}" text-anchor="end" dominant-baseline="middle">${escapeXml(String(Number(t.toPrecision(6))))}</text>`,
    );
  }
  const labelEvery = Math.max(1, Math.ceil(count / 12));
  const xLabels = series.points
    .filter((_, i) => i % labelEvery === 0)
    .map(
      (p) =>
        `<text x="${f(x(p.x))}" y="${size.height - margin.bottom + 16}" text-anchor="middle">${escapeXml(text.labels[p.position] ?? '')}</text>`,
    );

  const path = series.points.map((p) => `${f(x(p.x))},${f(y(p.y))}`).join(' ');
  const marks = series.points
    .map((p) => {
      const cx = x(p.x);
      const cy = y(p.y);
      if (p.status === 'signal')
        return `<polygon points="${f(cx)},${f(cy - 6)} ${f(cx + 6)},${f(cy + 5)} ${f(cx - 6)},${f(cy + 5)}" fill="${palette.signal}"><title>signal</title></polygon>`;
      if (p.status === 'excluded')
        return `<g stroke="${palette.excluded}" stroke-width="1.5" fill="none"><rect x="${f(cx - 5)}" y="${f(cy - 5)}" width="10" height="10"/><path d="M${f(cx - 5)} ${f(cy - 5)}L${f(cx + 5)} ${f(cy + 5)}M${f(cx + 5)} ${f(cy - 5)}L${f(cx - 5)} ${f(cy + 5)}"/><title>excluded</title></g>`;
      return `<circle cx="${f(cx)}" cy="${f(cy)}" r="2.5" fill="${palette.ink}"/>`;
    })
    .join('');

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${size.width}" height="${size.height}" viewBox="0 0 ${size.width} ${size.height}" font-family="DejaVu Sans, sans-serif" font-size="11" fill="${palette.ink}">`,
    `<rect width="100%" height="100%" fill="${palette.background}"/>`,
    `<text x="${margin.left}" y="20" font-size="13" font-weight="bold">${escapeXml(text.title)}</text>`,
    `<text transform="translate(14 ${margin.top + plotHeight / 2}) rotate(-90)" text-anchor="middle">${escapeXml(text.yTitle)}</text>`,
    ...ticks,
    ...xLabels,
    line(series.upper, palette.limit, '6 4'),
    line(series.lower, palette.limit, '6 4'),
    line(series.center, palette.center, ''),
    `<polyline points="${path}" fill="none" stroke="${palette.path}" stroke-width="1"/>`,
    marks,
    '</svg>',
  ].join('');
}
