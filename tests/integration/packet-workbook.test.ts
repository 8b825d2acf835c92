import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import {
  buildWorkbook,
  limitsCells,
  readWorkbookStatement,
  type WorkbookStatement,
} from '../../src-main/services/packet/packet-workbook.js';
import type { PacketContent } from '../../src-main/services/packet/packet-content.js';
import { inventedContent, inventedObservations } from './packet-fixtures.js';
import { readBytes, recalculateWithLibreOffice, scratch } from './packet-tools.js';

/**
 * The workbook's formulas are recomputed by LibreOffice (an independent spreadsheet engine) from
 * a copy without cached values, and every limit is compared with the core's within 1e-9, so a
 * wrong formula fails here.
 */
const cases: Record<string, PacketContent> = {
  sigmaU: inventedContent(40),
  laneyU: inventedContent(40, { limits: 'laney', multiplier: 3, alpha: 0.0027, rules: ['beyond'] }),
  probabilityU: inventedContent(40, {
    limits: 'probability',
    multiplier: 3,
    alpha: 0.0027,
    rules: ['beyond'],
  }),
  sigmaC: inventedContent(
    30,
    { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
    inventedObservations(30).map((o) => ({ ...o, units: 50 })),
  ),
  probabilityC: inventedContent(
    30,
    { limits: 'probability', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
    inventedObservations(30, 11).map((o) => ({ ...o, units: 50 })),
  ),
  typedText: typedTextContent(),
  knownRate: inventedContent(25, {
    limits: 'sigma',
    multiplier: 2.5,
    alpha: 0.0027,
    rules: ['beyond'],
    knownRate: 0.1,
  }),
};
const recalculated: Record<string, WorkbookStatement> = {};
const recalculatedBooks: Record<string, ExcelJS.Workbook> = {};

/** A user who typed formulas into a label, a cause and the reaction plan. */
function typedTextContent(): PacketContent {
  const observations = inventedObservations(20).map((o, i) => (i === 2 ? { ...o, label: '=1+1' } : o));
  const content = inventedContent(20, undefined, observations);
  content.exclusions[0]!.cause = {
    category: '@SUM(A1)',
    description: '+cmd|" /C calc"!A0',
    reference: '-2+3',
  };
  return content;
}
let sabotagedStatement: WorkbookStatement;

beforeAll(async () => {
  const folder = scratch('workbook');
  const names = Object.keys(cases);
  const files = await Promise.all(
    names.map(async (name) => {
      const path = join(folder, `${name}.xlsx`);
      writeFileSync(path, await buildWorkbook(cases[name]!, { withoutCachedValues: true }));
      return path;
    }),
  );
  // A copy with a wrong multiplier shows that these checks can fail.
  const sabotaged = new ExcelJS.Workbook();
  await sabotaged.xlsx.load(
    (await buildWorkbook(cases.sigmaU!, { withoutCachedValues: true })) as unknown as ExcelJS.Buffer,
  );
  sabotaged.getWorksheet('Limits')!.getCell(limitsCells.multiplier).value = 2.9;
  const sabotagedPath = join(folder, 'sabotaged.xlsx');
  await sabotaged.xlsx.writeFile(sabotagedPath);
  files.push(sabotagedPath);
  const converted = recalculateWithLibreOffice(files); // one LibreOffice start for every case
  sabotagedStatement = await readWorkbookStatement(readBytes(converted.at(-1)!));
  for (const [i, name] of names.entries()) {
    recalculated[name] = await readWorkbookStatement(readBytes(converted[i]!));
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(readBytes(converted[i]!) as unknown as ExcelJS.Buffer);
    recalculatedBooks[name] = book;
  }
}, 240_000);

describe.each(Object.keys(cases))('the %s workbook, recalculated by LibreOffice', (name) => {
  it('states the core’s center and every period’s limits within 1e-9', () => {
    const result = cases[name]!.result;
    const sheet = recalculated[name]!;
    expect(sheet.center).not.toBeNull();
    expect(Math.abs(sheet.center! - result.center)).toBeLessThan(1e-9);
    expect(sheet.periods).toHaveLength(result.periods.length);
    result.periods.forEach((p, i) => {
      const row = sheet.periods[i]!;
      expect(row.label).toBe(p.label);
      expect(Math.abs(row.ucl! - p.ucl), `${name} UCL of ${p.label}`).toBeLessThan(1e-9);
      if (p.lcl === null) expect(row.lcl, `${name} LCL of ${p.label}`).toBeNull();
      else expect(Math.abs(row.lcl! - p.lcl), `${name} LCL of ${p.label}`).toBeLessThan(1e-9);
    });
  });

  it('computes the dispersion statistic and its upper-tail probability as the core does', () => {
    const { dispersion } = cases[name]!.result;
    const sheet = recalculated[name]!;
    expect(Math.abs(sheet.dispersion.statistic! - dispersion.statistic)).toBeLessThan(
      1e-9 * Math.max(1, dispersion.statistic),
    );
    expect(Math.abs(sheet.dispersion.pOver! - dispersion.pOver)).toBeLessThan(1e-9);
  });

  it('has its probability-limit check cells hold (POISSON.DIST against α/2)', () => {
    const sheet = recalculated[name]!;
    if (cases[name]!.result.limits === 'probability') expect(sheet.checksHold).toBe(true);
    else expect(sheet.checksHold).toBeNull();
  });
});

describe('text a user typed', () => {
  it('stays text after LibreOffice recalculates: never run as a formula', () => {
    const book = recalculatedBooks.typedText!;
    expect(book.getWorksheet('Data')!.getCell('B4').value).toBe('=1+1');
    const exclusions = book.getWorksheet('Exclusions')!;
    expect(exclusions.getCell('B2').value).toBe('@SUM(A1)');
    expect(exclusions.getCell('C2').value).toBe('+cmd|" /C calc"!A0');
    expect(exclusions.getCell('D2').value).toBe('-2+3');
    const signOff = book.getWorksheet('Sign-off')!;
    const plan = [...Array(12).keys()]
      .map((r) => signOff.getRow(r + 1).getCell(2).value)
      .find((v) => String(v).startsWith('=HYPERLINK'));
    expect(plan).toMatch(/^=HYPERLINK\("http:\/\/example.invalid"\) Stop the line/);
  });
});

describe('the workbook as written', () => {
  it('gives other limits when its multiplier input is changed (the comparison can fail)', () => {
    const moved = sabotagedStatement.periods.filter(
      (p, i) => Math.abs(p.ucl! - cases.sigmaU!.result.periods[i]!.ucl) > 1e-6,
    );
    expect(moved).toHaveLength(cases.sigmaU!.result.periods.length);
  });

  it('carries cached values equal to the core, so readers without a calc engine show numbers', async () => {
    const content = cases.sigmaU!;
    const sheet = await readWorkbookStatement(await buildWorkbook(content));
    expect(sheet.center).toBe(content.result.center);
    expect(sheet.periods.map((p) => p.ucl)).toEqual(content.result.periods.map((p) => p.ucl));
  });
});
