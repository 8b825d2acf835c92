import type { PdfDoc } from './chart-pdf.js';

/**
 * A shortcut around OpenType shaping for the strings a packet prints by the thousand: numbers,
 * dates and period labels such as "P17" or "2026-03-01".
 *
 * pdfkit shapes each space-separated word with fontkit once and caches it; a data table's words
 * are nearly all different, so each costs a full shaping pass (substitution and positioning
 * lookups) that changes nothing for them. In DejaVu Sans and Sans Bold the digits neither kern
 * nor ligate with any neighbor, so a word of printable ASCII in which every adjacent pair has a
 * digit in it is exactly the concatenation of its characters, each shaped alone by fontkit.
 * tests/unit/packet-pdf-table-layout.test.ts checks both claims against fontkit for every pair
 * and for random words, so a font with digit kerning fails there rather than printing wrongly.
 * Any other word goes through fontkit as before.
 */

interface GlyphPosition {
  xAdvance: number;
  yAdvance: number;
  xOffset: number;
  yOffset: number;
  advanceWidth: number;
}

/** A shaped run as pdfkit's embedded font caches it (positions already in 1/1000 em). */
interface ShapedRun {
  glyphs: unknown[];
  positions: GlyphPosition[];
  advanceWidth: number;
}

/** The part of pdfkit's EmbeddedFont the shortcut uses; absent on standard fonts. */
interface ShapingFont {
  layoutCache?: Record<string, ShapedRun>;
  layoutCached?: (text: string) => ShapedRun;
  shortcutInstalled?: boolean;
}

const isDigit = (code: number) => code >= 48 && code <= 57;
const isPrintableAscii = (code: number) => code >= 32 && code <= 126;

/** True when the word's shaping is the concatenation of its characters' (see above). */
export function shapesCharacterByCharacter(word: string): boolean {
  if (word.length < 2) return false; // a single character is shaped (and cached) as it is
  let previous = word.charCodeAt(0);
  if (!isPrintableAscii(previous)) return false;
  for (let i = 1; i < word.length; i++) {
    const code = word.charCodeAt(i);
    if (!isPrintableAscii(code)) return false;
    if (!isDigit(code) && !isDigit(previous)) return false;
    previous = code;
  }
  return true;
}

/**
 * Makes the current font of `doc` shape qualifying words from its cached single characters.
 * Call after `doc.font(name)`; once per font is enough. A font without pdfkit's layout cache
 * (a standard PDF font, or a pdfkit that changed) is left alone and shapes as before.
 */
export function installLayoutShortcut(doc: PdfDoc): void {
  const font = (doc as unknown as { _font?: ShapingFont })._font;
  if (!font || font.shortcutInstalled) return;
  const cache = font.layoutCache;
  const shape = font.layoutCached;
  if (!cache || typeof shape !== 'function') return;
  const original = shape.bind(font);
  font.layoutCached = (text: string): ShapedRun => {
    const cached = cache[text];
    if (cached) return cached;
    if (!shapesCharacterByCharacter(text)) return original(text);
    const glyphs: unknown[] = [];
    const positions: GlyphPosition[] = [];
    let advanceWidth = 0;
    for (const character of text) {
      const run = original(character);
      glyphs.push(...run.glyphs);
      for (const position of run.positions) positions.push({ ...position });
      advanceWidth += run.advanceWidth;
    }
    const run = { glyphs, positions, advanceWidth };
    cache[text] = run;
    return run;
  };
  font.shortcutInstalled = true;
}
