import { readFileSync, writeFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makePacket } from '../../src-main/services/packet/make-packet.js';
import { verifyPacket } from '../../src-main/services/packet/packet-verify.js';
import { findSignatures, signPdf, signedBytes } from '../../src-main/services/packet/pdf-signature.js';
import { shown } from '../../src-main/services/packet/packet-words.js';
import { revisionAnalysis } from '../../src-main/services/signing/sign-off.js';
import { readPkcs12 } from '../../src-main/services/signing/pkcs12-identity.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';
import { limitsTable } from '../../src-main/services/packet/limits-table.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { makeP12 } from '../unit/signing-fixtures.js';
import { signedDemoStudy, writeStudy } from './packet-study.js';
import { run, scratch } from './packet-tools.js';

/**
 * The signed packet checked by tools that share no code with it: OpenSSL verifies the CMS over
 * the ByteRange content, poppler's pdfsig the signatures as a PDF reader does, pdftotext the words
 * and pdftoppm the pages.
 */
const folder = scratch('packet');
let company: SigningIdentity;
let companyCertificate: string;
let personal: SigningIdentity;
let study: Study;
let pdfPath: string;
let xlsxPath: string;
let pdf: Buffer;
let workbook: Buffer;

beforeAll(async () => {
  const p12 = makP12();
  company = readPkcs12(readFileSync(p12.path), p12.passphrase, 'company.p12');
  companyCertificate = p12.certificatePath;
  personal = await createPersonalIdentity({
    name: 'Rui Tanaka',
    organization: 'Wrenfield Enamel Works (invented)',
  });
  study = signedDemoStudy(personal, company);
  const studyPath = writeStudy(folder, 'demo.ledger', study);
  pdfPath = join(folder, 'packet.pdf');
  xlsxPath = join(folder, 'packet.xlsx');
  const made = await makePacket({
    studyPath,
    pdfPath,
    xlsxPath,
    paper: 'a4',
    identity: company,
    now: '2026-12-01T12:00:00.000+01:00',
  });
  if (!made.ok) throw new Error(JSON.stringify(made.findings));
  pdf = readFileSync(pdfPath);
  workbook = readFileSync(xlsxPath);
}, 120_000);

afterAll(() => rmSync(folder, { recursive: true, force: true }));

function makP12() {
  return makeP12(folder, 'company', 'rsa', 'Dana Okafor');
}

const analysis = () => {
  const revision = study.revisions.at(-1)!;
  const result = revisionAnalysis(study, revision);
  if (!result.ok) throw new Error('no analysis');
  return result.value;
};

describe('the signature', () => {
  it('verifies with openssl cms over the extracted ByteRange content, and against the signer’s certificate', () => {
    const [signature] = findSignatures(pdf);
    const content = join(folder, 'range.bin');
    const cms = join(folder, 'signature.der');
    writeFileSync(content, signedBytes(pdf, signature!));
    writeFileSync(cms, signature!.cms);
    const noChain = run('openssl', [
      'cms',
      '-verify',
      '-binary',
      '-inform',
      'DER',
      '-in',
      cms,
      '-content',
      content,
      '-noverify',
      '-out',
      '/dev/null',
    ]);
    expect(noChain.stderr).toMatch(/Verification successful/);
    // The company certificate is self-signed here, so it can act as its own trust anchor.
    const anchored = run('openssl', [
      'cms',
      '-verify',
      '-binary',
      '-inform',
      'DER',
      '-in',
      cms,
      '-content',
      content,
      '-CAfile',
      companyCertificate,
      '-purpose',
      'any',
      '-out',
      '/dev/null',
    ]);
    expect(anchored.stderr).toMatch(/Verification successful/);
    const signer = run('openssl', ['cms', '-cmsout', '-print', '-inform', 'DER', '-in', cms]).stdout;
    expect(signer).toMatch(/sha256/);
  });

  it('is valid for poppler’s pdfsig, with SHA-256 and the signer’s name', () => {
    const out = run('pdfsig', [pdfPath]).stdout;
    expect(out).toMatch(/Signer Certificate Common Name: Dana Okafor/);
    expect(out).toMatch(/Signing Hash Algorithm: SHA-256/);
    expect(out).toMatch(/Signature Validation: Signature is Valid\./);
    expect(out).toMatch(/Total document signed/);
  });

  it('passes verify, with the workbook, and with the company certificate trusted', async () => {
    const trusted = [
      Buffer.from(new (await import('node:crypto')).X509Certificate(readFileSync(companyCertificate)).raw),
    ];
    const verdict = await verifyPacket({ pdf, workbook, trusted });
    expect(verdict.lines.filter((l) => !l.ok)).toEqual([]);
    expect(verdict.ok).toBe(true);
    expect(verdict.lines.map((l) => l.text).join('\n')).toMatch(/trusted certificate/);
  });

  it('reports self-issued signers as such, and fails when a trusted list does not include the signer', async () => {
    const other = await createPersonalIdentity({ name: 'Somebody Else' });
    const verdict = await verifyPacket({ pdf, workbook, trusted: [other.certificate] });
    expect(verdict.ok).toBe(false);
    expect(verdict.lines[0]!.text).toMatch(/self-issued certificate, not in the trusted list/);
  });
});

describe('countersigning', () => {
  it('adds a second signature as an incremental update that leaves the first valid', async () => {
    const countersigned = await signPdf(pdf, personal, {
      reason: 'Countersignature: received by the customer',
    });
    expect(countersigned.subarray(0, pdf.length - 1).equals(pdf.subarray(0, pdf.length - 1))).toBe(true);
    const path = join(folder, 'countersigned.pdf');
    writeFileSync(path, countersigned);
    const out = run('pdfsig', [path]).stdout;
    expect(out.match(/Signature is Valid\./g)).toHaveLength(2);
    expect(out).toMatch(/Signer Certificate Common Name: Rui Tanaka/);
    const verdict = await verifyPacket({ pdf: countersigned, workbook });
    expect(verdict.lines.filter((l) => !l.ok)).toEqual([]);
    expect(findSignatures(countersigned)).toHaveLength(2);
  });

  it('does not hide a content change made before a countersignature', async () => {
    // Someone appends a new content stream as an update and countersigns over it.
    const text = pdf.toString('latin1');
    const size = Number(/\/Size (\d+)/.exec(text.slice(text.lastIndexOf('trailer')))![1]);
    const injected = Buffer.concat([
      pdf,
      Buffer.from(
        `\n${size} 0 obj\n<< /Length 21 >>\nstream\nBT /F1 40 Tf (X) Tj ET\nendstream\nendobj\n`,
        'latin1',
      ),
    ]);
    const countersigned = await signPdf(injected, personal, { reason: 'Countersignature' }).catch(() => null);
    const verdict = await verifyPacket({ pdf: countersigned ?? injected, workbook });
    expect(verdict.ok).toBe(false);
  });
});

describe('what the PDF says', () => {
  it('extracts the center line, the limits, the signers and the cautions as text', () => {
    const text = run('pdftotext', ['-layout', pdfPath, '-']).stdout;
    const result = analysis();
    expect(text).toContain(shown(result.center, 6));
    for (const row of limitsTable(result)) expect(text).toContain(shown(row.ucl, 8));
    expect(text).toMatch(/Rui Tanaka/);
    expect(text).toMatch(/Dana Okafor/);
    expect(text).toMatch(/prepared/);
    expect(text).toMatch(/approved/);
    expect(text).toMatch(/self-issued/);
    expect(text).toMatch(/do not replace specifications, inspection/);
    expect(text).toMatch(/burner 3 flame-out/);
    expect(text).toMatch(/UTC\+01:00/);
    const pages = Number(/Pages:\s+(\d+)/.exec(run('pdfinfo', [pdfPath]).stdout)![1]);
    for (let page = 1; page <= pages; page++) {
      const pageText = run('pdftotext', ['-f', String(page), '-l', String(page), pdfPath, '-']).stdout;
      expect(pageText, `page ${page}`).toContain(`Page ${page} of ${pages}`);
      expect(pageText, `page ${page}`).toContain(study.id);
    }
  });

  it('embeds DejaVu Sans and is A4; Letter is Letter', async () => {
    const fonts = run('pdffonts', [pdfPath]).stdout;
    expect(fonts).toMatch(/DejaVuSans\s/);
    expect(fonts).toMatch(/yes yes yes/);
    expect(run('pdfinfo', [pdfPath]).stdout).toMatch(/595\.28 x 841\.89 pts \(A4\)/);
    const letter = join(folder, 'letter.pdf');
    const made = await makePacket({
      studyPath: join(folder, 'demo.ledger'),
      pdfPath: letter,
      xlsxPath: join(folder, 'letter.xlsx'),
      paper: 'letter',
      now: '2026-12-01T12:00:00.000+01:00',
    });
    expect(made.ok).toBe(true);
    expect(run('pdfinfo', [letter]).stdout).toMatch(/612 x 792 pts \(letter\)/);
  });

  it('renders every page, and the chart page carries the limits, points and signals in their colors', () => {
    const prefix = join(folder, 'page');
    run('pdftoppm', ['-r', '50', pdfPath, prefix]);
    const pages = Number(/Pages:\s+(\d+)/.exec(run('pdfinfo', [pdfPath]).stdout)![1]);
    const images = Array.from({ length: pages }, (_, i) =>
      readPpm(`${prefix}-${String(i + 1).padStart(String(pages).length, '0')}.ppm`),
    );
    for (const image of images) expect(image.width).toBeGreaterThan(0);
    const chart = images[1]!;
    const count = (hex: string) => countNear(chart, hex, 40);
    expect(count('#0F766E'), 'teal limit pixels').toBeGreaterThan(100);
    expect(count('#3E5C76'), 'slate center pixels').toBeGreaterThan(100);
    expect(count('#B45309'), 'amber signal pixels').toBeGreaterThan(0);
    expect(count('#66717F'), 'excluded markers').toBeGreaterThan(0);
  });
});

describe('tampering', () => {
  it('fails verify for a one-byte change anywhere in the signed range', { timeout: 120_000 }, async () => {
    const [signature] = findSignatures(pdf);
    const [, length1, start2, length2] = signature!.byteRange;
    const positions = [
      ...Array.from({ length: 12 }, (_, i) => Math.floor(((i + 0.5) * length1) / 12)),
      ...Array.from({ length: 4 }, (_, i) => start2 + Math.floor(((i + 0.5) * length2) / 4)),
    ];
    for (const position of positions) {
      const changed = Buffer.from(pdf);
      changed[position] = changed[position]! ^ 0x01;
      const verdict = await verifyPacket({ pdf: changed });
      expect(verdict.ok, `byte ${position}`).toBe(false);
    }
  });

  it(
    'fails verify when the embedded study was changed before the PDF was made (and signed)',
    { timeout: 60_000 },
    async () => {
      const forged = structuredClone(study);
      forged.observations[3]!.count += 5; // a changed count, not through a correction
      const studyPath = writeStudy(folder, 'forged.ledger', forged);
      const { readFile } = await import('node:fs/promises');
      const { packetFiles } = await import('../../src-main/services/packet/make-packet.js');
      const { packetContent } = await import('../../src-main/services/packet/packet-from-study.js');
      const content = packetContent({
        study: forged,
        revision: forged.revisions.at(-1)!,
        studyBytes: await readFile(studyPath),
        studyFileName: 'forged.ledger',
        generatedAt: '2026-12-01T12:00:00.000+01:00',
      });
      if (!content.ok) throw new Error('no content');
      const files = await packetFiles(content.value, { paper: 'a4', identity: company });
      const verdict = await verifyPacket({ pdf: files.pdf, workbook: files.workbook });
      expect(verdict.ok).toBe(false);
      const failed = verdict.lines
        .filter((l) => !l.ok)
        .map((l) => l.text)
        .join('\n');
      expect(failed).toMatch(/record is broken|VOID/);
    },
  );

  it('fails verify for a changed workbook: one byte, or a changed limit cell', async () => {
    const flipped = Buffer.from(workbook);
    flipped[flipped.length - 30] = flipped[flipped.length - 30]! ^ 0x01;
    expect((await verifyPacket({ pdf, workbook: flipped })).ok).toBe(false);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(workbook as unknown as ExcelJS.Buffer);
    const cell = book.getWorksheet('Data')!.getCell('I3');
    cell.value = { formula: (cell.value as ExcelJS.CellFormulaValue).formula, result: 0.5 };
    const edited = Buffer.from(await book.xlsx.writeBuffer());
    const verdict = await verifyPacket({ pdf, workbook: edited });
    expect(verdict.ok).toBe(false);
    expect(
      verdict.lines
        .filter((l) => !l.ok)
        .map((l) => l.text)
        .join('\n'),
    ).toMatch(/SHA-256|differs/);
  });
});

interface Image {
  width: number;
  height: number;
  pixels: Buffer;
}

/** Binary PPM (P6), as pdftoppm writes it by default. */
function readPpm(path: string): Image {
  const bytes = readFileSync(path);
  const header = /^P6\s+(\d+)\s+(\d+)\s+(\d+)\s/.exec(bytes.subarray(0, 50).toString('latin1'))!;
  return { width: Number(header[1]), height: Number(header[2]), pixels: bytes.subarray(header[0].length) };
}

function countNear(image: Image, hex: string, tolerance: number): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
  let count = 0;
  for (let i = 0; i + 2 < image.pixels.length; i += 3) {
    if (
      Math.abs(image.pixels[i]! - r!) +
        Math.abs(image.pixels[i + 1]! - g!) +
        Math.abs(image.pixels[i + 2]! - b!) <
      tolerance
    )
      count++;
  }
  return count;
}
