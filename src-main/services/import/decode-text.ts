import { createRequire } from 'node:module';
import type { Finding, Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';

export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

export interface DecodedText {
  text: string;
  encoding: TextEncoding;
  source: 'given' | 'bom' | 'detected';
}

const aliases: Record<string, TextEncoding> = {
  'utf-8': 'utf-8',
  utf8: 'utf-8',
  'utf-16le': 'utf-16le',
  utf16le: 'utf-16le',
  'utf-16be': 'utf-16be',
  utf16be: 'utf-16be',
  'windows-1252': 'windows-1252',
  cp1252: 'windows-1252',
  'win-1252': 'windows-1252',
  latin1: 'windows-1252',
  'iso-8859-1': 'windows-1252',
};

export const encodingNames = ['utf-8', 'utf-16le', 'utf-16be', 'windows-1252'] as const;

/** The encoding a user named, or null when it is not one the importer reads. */
export function encodingFromName(name: string): TextEncoding | null {
  return aliases[name.trim().toLowerCase()] ?? null;
}

function bomEncoding(bytes: Uint8Array): { encoding: TextEncoding; length: number } | null {
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { encoding: 'utf-8', length: 3 };
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { encoding: 'utf-16le', length: 2 };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { encoding: 'utf-16be', length: 2 };
  return null;
}

const utf8 = new TextDecoder('utf-8');
let iconv: typeof import('iconv-lite') | undefined;

function decodeAs(bytes: Uint8Array, encoding: TextEncoding): string {
  // UTF-8, by far the most common, needs no library (TextDecoder strips its BOM); iconv-lite, loaded
  // only when needed, decodes the others and strips a BOM of the named encoding.
  if (encoding === 'utf-8') return utf8.decode(bytes);
  iconv ??= createRequire(import.meta.url)('iconv-lite') as typeof import('iconv-lite');
  return iconv.decode(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), encoding);
}

/**
 * Text from the bytes of a delimited file: a BOM decides (UTF-8, UTF-16 LE or BE: the "Unicode
 * text" spreadsheets write); without one, bytes that are valid UTF-8 are UTF-8 and anything else is
 * Windows-1252, the usual single-byte encoding of spreadsheet exports. A named encoding overrides.
 */
export function decodeText(bytes: Uint8Array, file: string, given?: TextEncoding): Result<DecodedText> {
  const bom = bomEncoding(bytes);
  if (given) {
    if (bom && bom.encoding !== given) {
      return fail({
        file,
        message: `starts with a ${bom.encoding} byte-order mark but --encoding ${given} was given; leave --encoding out or name ${bom.encoding}`,
      });
    }
    return ok({ text: decodeAs(bytes, given), encoding: given, source: 'given' });
  }
  if (bom) return ok({ text: decodeAs(bytes, bom.encoding), encoding: bom.encoding, source: 'bom' });
  if (looksLikeUtf16(bytes)) {
    const finding: Finding = {
      file,
      message:
        'looks like UTF-16 text without a byte-order mark; name it with --encoding utf-16le or --encoding utf-16be',
    };
    return fail(finding);
  }
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return ok({ text, encoding: 'utf-8', source: 'detected' });
  } catch {
    return ok({ text: decodeAs(bytes, 'windows-1252'), encoding: 'windows-1252', source: 'detected' });
  }
}

/** Many NUL bytes in alternate positions: ASCII text in UTF-16 (text files have no NULs otherwise). */
function looksLikeUtf16(bytes: Uint8Array): boolean {
  const sample = Math.min(bytes.length, 4096);
  if (sample < 4) return false;
  let even = 0;
  let odd = 0;
  for (let i = 0; i < sample; i++) {
    if (bytes[i] !== 0) continue;
    if (i % 2 === 0) even++;
    else odd++;
  }
  return Math.max(even, odd) > sample / 8;
}
