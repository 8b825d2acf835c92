import { createRequire } from 'node:module';
import fc from 'fast-check';
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import {
  installLayoutShortcut,
  shapesCharacterByCharacter,
} from '../../src-main/services/packet/pdf-text-layout.js';

// The reference throughout is fontkit's own shaping (GSUB and GPOS of the font), reached through
// pdfkit's layoutRun, which the shortcut never replaces.

interface Run {
  glyphs: { id: number }[];
  positions: { xAdvance: number; yAdvance: number; xOffset: number; yOffset: number; advanceWidth: number }[];
  advanceWidth: number;
}
interface EmbeddedFont {
  layoutRun(text: string): Run;
  layoutCached(text: string): Run;
  font: { layout(text: string): unknown };
}

const require = createRequire(import.meta.url);
const fontFiles = {
  'DejaVu Sans': require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf'),
  'DejaVu Sans Bold': require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf'),
};

function embeddedFont(file: string, shortcut: boolean): EmbeddedFont {
  const doc = new PDFDocument({ autoFirstPage: false });
  doc.font(file);
  if (shortcut) installLayoutShortcut(doc);
  return (doc as unknown as { _font: EmbeddedFont })._font;
}

/** What shaping decides: each glyph and where it goes. */
const shaped = (run: Run) => ({
  glyphs: run.glyphs.map((g) => g.id),
  positions: run.positions.map((p) => [p.xAdvance, p.yAdvance, p.xOffset, p.yOffset, p.advanceWidth]),
  advanceWidth: run.advanceWidth,
});
const joined = (a: Run, b: Run) => ({
  glyphs: [...shaped(a).glyphs, ...shaped(b).glyphs],
  positions: [...shaped(a).positions, ...shaped(b).positions],
  advanceWidth: a.advanceWidth + b.advanceWidth,
});

const digits = [...'0123456789'];
const printable = Array.from({ length: 95 }, (_, i) => String.fromCharCode(32 + i));

describe.each(Object.entries(fontFiles))('%s', (_name, file) => {
  const reference = embeddedFont(file, false);

  it('kerns or ligates no digit with any printable ASCII neighbor, on either side', () => {
    const interacting: string[] = [];
    for (const digit of digits) {
      for (const other of printable) {
        for (const pair of [digit + other, other + digit]) {
          const whole = shaped(reference.layoutRun(pair));
          const parts = joined(reference.layoutRun(pair[0]!), reference.layoutRun(pair[1]!));
          if (JSON.stringify(whole) !== JSON.stringify(parts)) interacting.push(pair);
        }
      }
    }
    expect(interacting).toEqual([]);
  });

  it('does kern some pairs without a digit, which the shortcut therefore leaves to fontkit', () => {
    for (const pair of ['P.', 'To', 'AV']) {
      expect(shapesCharacterByCharacter(pair)).toBe(false);
      const whole = shaped(reference.layoutRun(pair));
      const parts = joined(reference.layoutRun(pair[0]!), reference.layoutRun(pair[1]!));
      expect(JSON.stringify(whole)).not.toBe(JSON.stringify(parts));
    }
  });

  it('shapes every word it accepts exactly as fontkit does', () => {
    const withShortcut = embeddedFont(file, true);
    // Words in which every neighbor pair holds a digit: labels, dates, numbers, with a trailing space
    // as pdfkit's word splitting leaves it.
    const word = fc
      .tuple(
        fc.array(fc.tuple(fc.constantFrom(...printable), fc.constantFrom(...digits)), {
          minLength: 1,
          maxLength: 6,
        }),
        fc.boolean(),
        fc.boolean(),
      )
      .map(([pairs, leadingDigit, trailingSpace]) => {
        const text = pairs.map(([c, d]) => c + d).join('');
        return (leadingDigit ? text.slice(1) : text) + (trailingSpace ? ' ' : '');
      })
      .filter((text) => text.length >= 2);
    fc.assert(
      fc.property(word, (text) => {
        expect(shapesCharacterByCharacter(text)).toBe(true);
        expect(shaped(withShortcut.layoutCached(text))).toEqual(shaped(reference.layoutRun(text)));
      }),
      { numRuns: 300 },
    );
  });
});

describe('shapesCharacterByCharacter', () => {
  it('takes numbers, dates and labels with digits between letters', () => {
    for (const word of ['0.120408', '-1.5', '2026-03-01', 'P17', '12,', '3009/24990']) {
      expect(shapesCharacterByCharacter(word)).toBe(true);
    }
  });

  it('leaves to fontkit any pair without a digit, non-ASCII text and single characters', () => {
    for (const word of ['4.55e-70', 'Week', 'P.1', 'k̄', '−1', '1…', 'Σ1', '7']) {
      expect(shapesCharacterByCharacter(word)).toBe(false);
    }
  });
});

describe('installLayoutShortcut', () => {
  it('shapes a table of numbers with a handful of fontkit layouts instead of one per number', () => {
    const count = (shortcut: boolean) => {
      const font = embeddedFont(fontFiles['DejaVu Sans'], shortcut);
      let layouts = 0;
      const original = font.font.layout.bind(font.font);
      font.font.layout = (text: string) => {
        layouts++;
        return original(text);
      };
      for (let i = 0; i < 500; i++) font.layoutCached(`${(i * 0.0137).toFixed(5)}`);
      return layouts;
    };
    expect(count(false)).toBe(500);
    expect(count(true)).toBeLessThanOrEqual(11); // the ten digits and the point, each once
  });
});
