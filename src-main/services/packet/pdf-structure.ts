import { inflateSync } from 'node:zlib';

/**
 * Just enough reading of a PDF's objects to find its embedded files and to tell what an
 * incremental update changed. Works on classic cross-reference tables as pdfkit and @signpdf write
 * them; streams are skipped by their /Length so binary data is never mistaken for syntax.
 */
export interface PdfObject {
  number: number;
  generation: number;
  /** Offset of "N G obj". */
  start: number;
  /** Offset just past "endobj". */
  end: number;
  /** The object's text before any stream data (its dictionary, or its whole value). */
  head: string;
  stream?: { start: number; end: number };
}

export function listObjects(pdf: Buffer): PdfObject[] {
  const text = pdf.toString('latin1');
  const objects: PdfObject[] = [];
  const header = /(\d+)\s+(\d+)\s+obj\b/g;
  let at = 0;
  for (;;) {
    header.lastIndex = at;
    const match = header.exec(text);
    if (!match) break;
    const bodyStart = match.index + match[0].length;
    const streamAt = nextToken(text, bodyStart);
    const headEnd = streamAt.index;
    const head = text.slice(bodyStart, headEnd);
    let end: number;
    let stream: PdfObject['stream'];
    if (streamAt.token === 'stream') {
      let dataStart = headEnd + 'stream'.length;
      if (text[dataStart] === '\r') dataStart++;
      if (text[dataStart] === '\n') dataStart++;
      const length = /\/Length\s+(\d+)(?!\s+\d+\s+R)/.exec(head);
      const dataEnd = length ? dataStart + Number(length[1]) : text.indexOf('endstream', dataStart);
      stream = { start: dataStart, end: dataEnd };
      const close = text.indexOf('endobj', dataEnd);
      end = close === -1 ? text.length : close + 'endobj'.length;
    } else {
      end = headEnd === -1 ? text.length : headEnd + 'endobj'.length;
    }
    objects.push({
      number: Number(match[1]),
      generation: Number(match[2]),
      start: match.index,
      end,
      head,
      ...(stream ? { stream } : {}),
    });
    at = end;
  }
  return objects;
}

/** The offset of the first "stream" or "endobj" keyword outside strings after `from`. */
function nextToken(text: string, from: number): { index: number; token: 'stream' | 'endobj' | null } {
  let depth = 0;
  for (let i = from; i < text.length; i++) {
    const c = text[i];
    if (c === '(') {
      // A literal string: skip it, honoring escapes and nested parentheses.
      let nest = 1;
      for (i++; i < text.length && nest > 0; i++) {
        if (text[i] === '\\') i++;
        else if (text[i] === '(') nest++;
        else if (text[i] === ')') nest--;
      }
      i--;
    } else if (c === '<' && text[i + 1] === '<') {
      depth++;
      i++;
    } else if (c === '>' && text[i + 1] === '>') {
      depth--;
      i++;
    } else if (depth <= 0 && text.startsWith('stream', i) && !text.startsWith('streamx', i)) {
      return { index: i, token: 'stream' };
    } else if (depth <= 0 && text.startsWith('endobj', i)) {
      return { index: i, token: 'endobj' };
    }
  }
  return { index: -1, token: null };
}

export function streamBytes(pdf: Buffer, object: PdfObject): Buffer {
  if (!object.stream) return Buffer.alloc(0);
  const raw = pdf.subarray(object.stream.start, object.stream.end);
  return /\/Filter\s*\/FlateDecode/.test(object.head) ? inflateSync(raw) : Buffer.from(raw);
}

export interface EmbeddedFile {
  name: string;
  /** null when the stream cannot be decoded (damaged). */
  bytes: Buffer | null;
}

/** The files attached to the PDF (Filespec objects with an /EF entry), latest definitions winning. */
export function embeddedFiles(pdf: Buffer): EmbeddedFile[] {
  const objects = listObjects(pdf);
  const latest = new Map<number, PdfObject>();
  for (const object of objects) latest.set(object.number, object);
  const files: EmbeddedFile[] = [];
  for (const object of latest.values()) {
    if (!/\/Type\s*\/Filespec/.test(object.head)) continue;
    const name =
      /\/UF\s*\(((?:\\.|[^\\)])*)\)/.exec(object.head)?.[1] ??
      /\/F\s*\(((?:\\.|[^\\)])*)\)/.exec(object.head)?.[1];
    const reference = /\/EF\s*<<\s*\/F\s+(\d+)\s+\d+\s+R/.exec(object.head);
    const target = reference ? latest.get(Number(reference[1])) : undefined;
    if (name === undefined || !target) continue;
    let bytes: Buffer | null;
    try {
      bytes = streamBytes(pdf, target);
    } catch {
      bytes = null; // a damaged stream: the caller reports it
    }
    files.push({ name: name.replace(/\\([()\\])/g, '$1'), bytes });
  }
  return files;
}

/**
 * What an incremental update after `from` adds, judged object by object: signature dictionaries,
 * signature widgets, the form that lists them, and the catalog and page rewritten only to point at
 * them are allowed; any other object, and any stream, is a change to the document.
 */
export function changesAfter(pdf: Buffer, from: number): string[] {
  const objects = listObjects(pdf);
  const before = new Map<number, PdfObject>();
  for (const object of objects) if (object.end <= from) before.set(object.number, object);
  const problems: string[] = [];
  for (const object of objects) {
    if (object.start < from) continue;
    const head = object.head;
    const what = `object ${object.number}`;
    if (object.stream) {
      problems.push(`${what} adds or replaces a stream (page content, image, font or file)`);
      continue;
    }
    if (
      /\/Type\s*\/Sig\b/.test(head) ||
      (/\/Subtype\s*\/Widget/.test(head) && /\/FT\s*\/Sig/.test(head)) ||
      /\/Type\s*\/AcroForm/.test(head)
    ) {
      continue;
    }
    const previous = before.get(object.number);
    const normalize = (s: string) =>
      s
        .replace(/\/Annots\s*\[[^\]]*\]/g, '')
        .replace(/\/AcroForm\s+\d+\s+\d+\s+R/g, '')
        .replace(/\s+/g, ' ')
        .trim();
    if (
      (/\/Type\s*\/Catalog/.test(head) || /\/Type\s*\/Page\b/.test(head)) &&
      previous &&
      normalize(previous.head) === normalize(head)
    ) {
      continue;
    }
    problems.push(`${what} is changed or added after a signature and is not part of a signature`);
  }
  return problems;
}
