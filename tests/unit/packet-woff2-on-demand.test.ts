import { createRequire } from 'node:module';
import { brotliCompressSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { deferWoff2Decoder } from '../../src-main/services/packet/woff2-on-demand.js';

/**
 * The stand-in for fontkit's brotli decoder: nothing of the decoder is loaded until it is called,
 * and then it decodes as the real one does (checked against Node's own brotli encoder, zlib).
 */
const fromFontkit = createRequire(
  createRequire(createRequire(import.meta.url).resolve('pdfkit')).resolve('fontkit'),
);
const decoderPath = fromFontkit.resolve('brotli/decompress.js');
const loadedDictionary = () =>
  Object.keys(fromFontkit.cache).some((path) => path.includes('dictionary-data'));

describe('the WOFF2 decoder on demand', () => {
  it('loads nothing of brotli until called, then decodes what zlib encoded', () => {
    expect(fromFontkit.cache[decoderPath]).toBeUndefined();
    deferWoff2Decoder();
    const standIn = fromFontkit.cache[decoderPath]!.exports as (buffer: Uint8Array) => Uint8Array;
    expect(loadedDictionary()).toBe(false);
    const text = 'Invented panel PX-200, shift 7: 3 solder bridges in 50 boards. '.repeat(40);
    const decoded = standIn(brotliCompressSync(Buffer.from(text)));
    expect(Buffer.from(decoded).toString('utf8')).toBe(text);
    expect(loadedDictionary()).toBe(true);
    expect(fromFontkit.cache[decoderPath]!.exports).not.toBe(standIn);
  });
});
