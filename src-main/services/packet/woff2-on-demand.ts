import { createRequire, Module } from 'node:module';

/**
 * Keeps fontkit from compiling its WOFF2 decoder before a WOFF2 font is ever opened. fontkit
 * imports the brotli decompressor at load, and in Node that pulls in a 740 KB JavaScript module
 * holding brotli's dictionary: tens of milliseconds of parsing for the PDF thread, for fonts the
 * packet never uses (it embeds DejaVu TrueType files). A stand-in takes the decoder's place in
 * Node's CommonJS cache and loads the real one on its first call, so a WOFF2 font still opens.
 *
 * Call before pdfkit is imported. Where the modules cannot be found (a changed layout of
 * node_modules), nothing is done and fontkit loads the decoder itself, as before.
 */
export function deferWoff2Decoder(): void {
  try {
    const fromPdfkit = createRequire(createRequire(import.meta.url).resolve('pdfkit'));
    const fromFontkit = createRequire(fromPdfkit.resolve('fontkit'));
    const path = fromFontkit.resolve('brotli/decompress.js');
    if (fromFontkit.cache[path]) return;
    let decoder: ((buffer: Uint8Array, size?: number) => Uint8Array) | undefined;
    const standIn = new Module(path);
    standIn.filename = path;
    standIn.loaded = true;
    standIn.exports = (buffer: Uint8Array, size?: number) => {
      if (!decoder) {
        delete fromFontkit.cache[path];
        decoder = fromFontkit(path) as typeof decoder;
      }
      return decoder!(buffer, size);
    };
    fromFontkit.cache[path] = standIn;
  } catch {
    // fontkit loads the decoder itself
  }
}
