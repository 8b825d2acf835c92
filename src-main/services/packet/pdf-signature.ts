import placeholderModule from '@signpdf/placeholder-plain';
import signpdfModule, { type SignPdf } from '@signpdf/signpdf';
import { IdentitySigner } from '../signing/cms-signer.js';
import type { SigningIdentity } from '../signing/signing-identity.js';

type PlaceholderModule = typeof import('@signpdf/placeholder-plain');
const { plainAddPlaceholder } = ((placeholderModule as { default?: PlaceholderModule }).default ??
  placeholderModule) as PlaceholderModule;
// A CommonJS module: under ESM its default export arrives as `.default` of the namespace.
const signpdf: SignPdf =
  (signpdfModule as unknown as { default?: SignPdf }).default ?? (signpdfModule as unknown as SignPdf);

export interface SignatureRequest {
  /** Why this signature is made: "Approval packet" or "Countersignature: received by customer". */
  reason: string;
  location?: string;
  contactInfo?: string;
  signingTime?: Date;
}

/**
 * Adds a detached CMS signature (SHA-256, RSA, the signer's certificate) over the PDF's ByteRange.
 * On a PDF that is already signed, the placeholder and signature are appended as an incremental
 * update, so the bytes the earlier signatures cover are left as they were and stay valid.
 */
export async function signPdf(
  pdf: Buffer,
  identity: SigningIdentity,
  request: SignatureRequest,
): Promise<Buffer> {
  const withPlaceholder = plainAddPlaceholder({
    pdfBuffer: pdf,
    reason: request.reason,
    contactInfo: request.contactInfo ?? '',
    name: identity.facts.commonName,
    location: request.location ?? '',
    ...(request.signingTime ? { signingTime: request.signingTime } : {}),
    // Room for the CMS: the certificate chain plus the signature, in hex.
    signatureLength: 8192 + identity.chain.reduce((sum, der) => sum + der.length, 0) * 2,
    appName: 'LimitLedger',
  });
  return signpdf.sign(withPlaceholder, new IdentitySigner(identity), request.signingTime);
}

export interface PdfSignature {
  /** [start1, length1, start2, length2] as written in the signature dictionary. */
  byteRange: [number, number, number, number];
  /** The CMS bytes from /Contents, without the zero padding. */
  cms: Buffer;
  name: string | null;
  reason: string | null;
  /** Offset just past the bytes this signature covers. */
  coveredEnd: number;
  /** Number of the PDF object holding the signature dictionary. */
  objectNumber: number | null;
}

/** Every signature dictionary in the file, in file order (the first signature first). */
export function findSignatures(pdf: Buffer): PdfSignature[] {
  const text = pdf.toString('latin1');
  const found: PdfSignature[] = [];
  const pattern = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/g;
  for (let match = pattern.exec(text); match; match = pattern.exec(text)) {
    const byteRange = [1, 2, 3, 4].map((i) => Number(match![i])) as [number, number, number, number];
    const [, length1, start2] = byteRange;
    const hexText = text.slice(length1 + 1, start2 - 1);
    const cmsPadded = /^[0-9a-fA-F]*$/.test(hexText) ? Buffer.from(hexText, 'hex') : Buffer.alloc(0);
    const objectStart = text.lastIndexOf(' obj', match.index);
    const objectHeader = /(\d+)\s+\d+\s*$/.exec(text.slice(Math.max(0, objectStart - 20), objectStart));
    const dictionaryEnd = text.indexOf('endobj', match.index);
    const dictionary = text.slice(objectStart, dictionaryEnd === -1 ? undefined : dictionaryEnd);
    found.push({
      byteRange,
      cms: trimDer(cmsPadded),
      name: pdfString(dictionary, 'Name'),
      reason: pdfString(dictionary, 'Reason'),
      coveredEnd: byteRange[2] + byteRange[3],
      objectNumber: objectHeader ? Number(objectHeader[1]) : null,
    });
  }
  return found;
}

/** The bytes a signature covers: both parts of its ByteRange, joined. */
export function signedBytes(pdf: Buffer, signature: PdfSignature): Buffer {
  const [start1, length1, start2, length2] = signature.byteRange;
  return Buffer.concat([pdf.subarray(start1, start1 + length1), pdf.subarray(start2, start2 + length2)]);
}

/** The /Contents hex holds the DER followed by zero padding; its outer length says where it ends. */
function trimDer(padded: Buffer): Buffer {
  if (padded.length < 2 || padded[0] !== 0x30) return padded;
  let length = padded[1]!;
  let header = 2;
  if (length & 0x80) {
    const octets = length & 0x7f;
    length = 0;
    for (let i = 0; i < octets; i++) length = length * 256 + padded[2 + i]!;
    header += octets;
  }
  return padded.subarray(0, Math.min(padded.length, header + length));
}

/** A literal (…) or hex <FEFF…> string value of /Key in a dictionary's text. */
function pdfString(dictionary: string, key: string): string | null {
  const literal = new RegExp(`/${key}\\s*\\(((?:\\\\.|[^\\\\)])*)\\)`).exec(dictionary);
  if (literal) return literal[1]!.replace(/\\([()\\])/g, '$1');
  const hex = new RegExp(`/${key}\\s*<([0-9A-Fa-f]*)>`).exec(dictionary);
  if (!hex) return null;
  const bytes = Buffer.from(hex[1]!, 'hex');
  return bytes[0] === 0xfe && bytes[1] === 0xff
    ? bytes.subarray(2).swap16().toString('utf16le')
    : bytes.toString('latin1');
}
