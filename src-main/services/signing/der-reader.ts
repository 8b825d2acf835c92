/**
 * A minimal DER reader (ITU-T X.690) that keeps byte offsets, so that a signature can be checked
 * over the exact bytes that were signed rather than over a re-encoding.
 */
export interface Tlv {
  tag: number;
  /** Offset of the tag byte. */
  start: number;
  /** Offset of the first content byte. */
  contentStart: number;
  /** Offset just past the last content byte. */
  end: number;
}

export function readTlv(bytes: Uint8Array, offset: number): Tlv {
  if (offset + 2 > bytes.length) throw new Error(`DER: truncated at byte ${offset}`);
  const tag = bytes[offset]!;
  if ((tag & 0x1f) === 0x1f) throw new Error(`DER: multi-byte tags are not used here (byte ${offset})`);
  let length = bytes[offset + 1]!;
  let contentStart = offset + 2;
  if (length & 0x80) {
    const octets = length & 0x7f;
    if (octets === 0 || octets > 4) throw new Error(`DER: unsupported length at byte ${offset}`);
    length = 0;
    for (let i = 0; i < octets; i++) length = length * 256 + bytes[contentStart + i]!;
    contentStart += octets;
  }
  const end = contentStart + length;
  if (end > bytes.length) throw new Error(`DER: element at byte ${offset} runs past the end`);
  return { tag, start: offset, contentStart, end };
}

export function children(bytes: Uint8Array, parent: Tlv): Tlv[] {
  const items: Tlv[] = [];
  for (let at = parent.contentStart; at < parent.end;) {
    const item = readTlv(bytes, at);
    items.push(item);
    at = item.end;
  }
  return items;
}

export const raw = (bytes: Uint8Array, tlv: Tlv) => bytes.subarray(tlv.start, tlv.end);
export const content = (bytes: Uint8Array, tlv: Tlv) => bytes.subarray(tlv.contentStart, tlv.end);

/** Dotted form of an OBJECT IDENTIFIER's content bytes. */
export function oidText(bytes: Uint8Array, tlv: Tlv): string {
  const body = content(bytes, tlv);
  const parts: number[] = [];
  let value = 0;
  for (const byte of body) {
    value = value * 128 + (byte & 0x7f);
    if (!(byte & 0x80)) {
      if (parts.length === 0)
        parts.push(value < 80 ? Math.floor(value / 40) : 2, value < 80 ? value % 40 : value - 80);
      else parts.push(value);
      value = 0;
    }
  }
  return parts.join('.');
}
