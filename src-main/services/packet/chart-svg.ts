import type { ChartDrawing, Primitive } from './chart-layout.js';

const escape = (text: string) =>
  text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const n = (value: number) => Number(value.toFixed(2));
const points = (list: [number, number][]) => list.map(([x, y]) => `${n(x)},${n(y)}`).join(' ');

/** The chart as a standalone SVG document, drawn from the same layout as the PDF chart. */
export function chartSvg(drawing: ChartDrawing, title: string): string {
  const body = drawing.primitives.map(svgElement).join('\n');
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${drawing.width}pt" height="${drawing.height}pt" viewBox="0 0 ${drawing.width} ${drawing.height}" role="img" font-family="DejaVu Sans, Verdana, sans-serif">`,
    `<title>${escape(title)}</title>`,
    body,
    '</svg>',
    '',
  ].join('\n');
}

function svgElement(p: Primitive): string {
  switch (p.kind) {
    case 'rect':
      return `<rect x="${n(p.x)}" y="${n(p.y)}" width="${n(p.width)}" height="${n(p.height)}" fill="${p.fill ?? 'none'}"${
        p.stroke ? ` stroke="${p.stroke}" stroke-width="${p.lineWidth ?? 1}"` : ''
      }/>`;
    case 'polyline':
      return `<polyline points="${points(p.points)}" fill="none" stroke="${p.stroke}" stroke-width="${p.lineWidth}"${
        p.dash ? ` stroke-dasharray="${p.dash.join(' ')}"` : ''
      }/>`;
    case 'circle':
      return `<circle cx="${n(p.x)}" cy="${n(p.y)}" r="${n(p.radius)}" fill="${p.fill}"/>`;
    case 'polygon':
      return `<polygon points="${points(p.points)}" fill="${p.fill}"/>`;
    case 'text': {
      const transform = p.rotate ? ` transform="rotate(${-p.rotate} ${n(p.x)} ${n(p.y)})"` : '';
      return `<text x="${n(p.x)}" y="${n(p.y)}" font-size="${p.size}" fill="${p.color}" text-anchor="${p.anchor}"${
        p.bold ? ' font-weight="bold"' : ''
      }${transform}>${escape(p.text)}</text>`;
    }
  }
}
