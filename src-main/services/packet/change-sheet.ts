import type ExcelJS from 'exceljs';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import type { ChangeContent, PacketContent } from './packet-content.js';
import { signOffWords } from './packet-words.js';

/**
 * The "Change" sheet of a change packet's workbook: the reason, the approved revision's periods
 * and limits, the rate comparison and the old and new limits at typical k, with the ARL table and
 * the check for a step as values.
 *
 * What a spreadsheet can recompute is a formula: Σx and Σk of the approved periods (SUMIF over the
 * periods listed on this sheet) and of the proposed ones (the Limits sheet's cells), the rate
 * ratio, the Clopper–Pearson interval (BETA.INV, mapped to the ratio by R = p·t_a/((1 − p)·t_n))
 * and sigma or Laney limits at each k. The exact two-sided p-value, probability limits and run
 * lengths need sums a spreadsheet has no function for: they are values, each with its source named.
 *
 * The user's words (reason, names, labels) are written as text cells, never as formulas.
 */

/** Where the Change sheet keeps its recomputed quantities, for tests and readers. */
export const changeCells = {
  approvedCount: 'B8',
  approvedUnits: 'B9',
  proposedCount: 'B10',
  proposedUnits: 'B11',
  approvedRate: 'B12',
  ratio: 'B13',
  ciLow: 'B18',
  ciHigh: 'B19',
  pValue: 'B20',
  approvedMultiplier: 'B22',
  approvedSigmaZ: 'B23',
  /** First row of the limits comparison (one row per typical k, columns A–H). */
  limitsTop: 27,
} as const;

type Formula = (text: string, value: number | string | boolean | null) => ExcelJS.CellFormulaValue;

const none = 'none';
const ink = 'FF1F2933';
const headerFill: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFE9ECEE' } };

export function addChangeSheet(book: ExcelJS.Workbook, content: PacketContent, formula: Formula): void {
  const change = content.change;
  if (!change) return;
  const sheet = book.addWorksheet('Change');
  const { evidence, approved } = change;
  const test = evidence.comparison;
  const a = approved.result;
  const p = content.result;

  // The approved periods, listed below everything else, are what the approved sums add up.
  const periodsTop =
    changeCells.limitsTop + evidence.limits.length + 14 + (evidence.arl?.approved.points.length ?? 0);
  const first = periodsTop + 1;
  const last = periodsTop + a.periods.length;
  const status = `$E$${first}:$E$${last}`;
  const sumIncluded = (column: string) =>
    `SUMIF(${status},"<>excluded",$${column}$${first}:$${column}$${last})`;
  const confidence = test.confidence;
  const half = (1 - confidence) / 2;
  // The proportion bounds behind the ratio's bounds (the inverse of the mapping), cached beside their formulas.
  const toP = (ratio: number) => (ratio * test.new.units) / (test.base.units + ratio * test.new.units);
  const pLow = test.new.count === 0 ? 0 : toP(test.ciLow);
  const pHigh = test.ciHigh === null ? 1 : toP(test.ciHigh);

  sheet.getCell('A1').value = text(
    `Limit change: revision ${content.revision.number} replaces revision ${approved.number}`,
  );
  sheet.getCell('A1').font = { bold: true, size: 13, color: { argb: ink } };
  header(sheet.getRow(2), ['Quantity', 'Value', 'How']);
  const rows: [string, ExcelJS.CellValue, string][] = [
    ['Reason for the change', text(change.reasonWords ?? change.reasonCategory ?? ''), 'category'],
    ['In the proposer’s words', text(change.reason), ''],
    [
      'Replaces revision',
      approved.number,
      text(
        `approved; effective ${approved.effectiveDate ?? '(not set)'}, review ${approved.reviewDate ?? '(not set)'}`,
      ),
    ],
    ['Approved sign-offs', text(approved.signOffs.map(signOffWords).join('; ')), ''],
    [
      'Wider limits',
      evidence.wider ? 'yes: extra scrutiny' : 'no',
      'a proposed UCL above the approved one at some k',
    ],
    [
      'Σx, approved (included)',
      formula(sumIncluded('C'), test.base.count),
      'SUMIF over the approved periods below',
    ],
    [
      'Σk, approved (included)',
      formula(sumIncluded('D'), test.base.units),
      'SUMIF over the approved periods below',
    ],
    ['Σx, proposed (included)', formula('Limits!$B$3', test.new.count), 'the Limits sheet'],
    ['Σk, proposed (included)', formula('Limits!$B$4', test.new.units), 'the Limits sheet'],
    [
      'ū, approved rate',
      a.rateSource === 'known' ? a.rate : formula('B8/B9', a.rate),
      a.rateSource === 'known' ? 'the known (standard) rate: an input' : '= Σx / Σk',
    ],
    [
      'Rate ratio, new / approved',
      formula(`IF(B8=0,"${none}",(B10/B11)/(B8/B9))`, test.ratio),
      '(Σx_new/Σk_new)/(Σx_approved/Σk_approved)',
    ],
    [
      'N = Σx_approved + Σx_new',
      formula('B8+B10', test.conditional.total),
      'the total the exact test conditions on',
    ],
    [
      'p₀ = Σk_new/(Σk_approved + Σk_new)',
      formula('B11/(B9+B11)', test.conditional.nullProportion),
      'x_new ~ Binomial(N, p₀) when the rate is unchanged',
    ],
    [
      'p lower (Clopper–Pearson)',
      formula(`IF(B10=0,0,_xlfn.BETA.INV(${half},B10,B14-B10+1))`, pLow),
      `Clopper & Pearson (1934), ${Math.round(confidence * 100)} %`,
    ],
    [
      'p upper (Clopper–Pearson)',
      formula(`IF(B10=B14,1,_xlfn.BETA.INV(${1 - half},B10+1,B14-B10))`, pHigh),
      '',
    ],
    [
      `Ratio, lower ${Math.round(confidence * 100)} % bound`,
      formula('B16*B9/((1-B16)*B11)', test.ciLow),
      'R = p·Σk_approved/((1 − p)·Σk_new)',
    ],
    [
      `Ratio, upper ${Math.round(confidence * 100)} % bound`,
      formula(`IF(B17>=1,"${none}",B17*B9/((1-B17)*B11))`, test.ciHigh),
      'R = p·Σk_approved/((1 − p)·Σk_new)',
    ],
    [
      'p-value, two-sided exact',
      test.pValue,
      'a value: Przyborowski & Wilenski (1940) conditional test, outcomes no more probable than the observed one summed (Limit Ledger, rate-ratio-test)',
    ],
    [
      'Over-dispersion',
      text(
        evidence.warnings.find((w) => w.code === 'test-optimistic')?.message ??
          'not found: the Poisson test applies',
      ),
      '',
    ],
    ['L, approved multiplier', a.multiplier, 'input: the approved revision’s method'],
    [
      'σz, approved',
      a.sigmaZ ?? 1,
      a.limits === 'laney' ? 'Laney σz of the approved study (a value)' : 'not used (1)',
    ],
  ];
  rows.forEach(([label, value, how], i) => {
    const row = sheet.getRow(i + 3);
    row.getCell(1).value = label;
    row.getCell(2).value = value;
    row.getCell(3).value = how;
  });
  // --- Old and new limits at typical k
  const top = changeCells.limitsTop;
  sheet.getRow(top - 2).getCell(1).value = 'Old and new limits at typical k (each on its own plotted scale)';
  sheet.getRow(top - 2).getCell(1).font = { bold: true };
  header(sheet.getRow(top - 1), [
    'Units k',
    'Approved center',
    'Approved LCL',
    'Approved UCL',
    'Proposed center',
    'Proposed LCL',
    'Proposed UCL',
    'Wider',
  ]);
  const approvedCells = { rate: '$B$12', multiplier: '$B$22', sigmaZ: '$B$23' };
  const proposedCells = { rate: 'Limits!$B$5', multiplier: 'Limits!$B$6', sigmaZ: 'Limits!$B$7' };
  evidence.limits.forEach((l, i) => {
    const r = top + i;
    const row = sheet.getRow(r);
    row.getCell(1).value = l.units;
    limitCells(row, 2, a, approvedCells, `A${r}`, l.approved, formula);
    limitCells(row, 5, p, proposedCells, `A${r}`, l.proposed, formula);
    row.getCell(8).value = formula(`IF(G${r}>D${r},"wider","no")`, l.wider ? 'wider' : 'no');
  });

  // --- Average run lengths and the step check: values with their method
  let r = top + evidence.limits.length + 1;
  const put = (values: ExcelJS.CellValue[], bold = false) => {
    values.forEach((v, i) => (sheet.getRow(r).getCell(i + 1).value = v));
    if (bold) sheet.getRow(r).font = { bold: true };
    r++;
  };
  if (evidence.arl) {
    put(
      [
        `Average run length at k = ${evidence.arl.units} (values: exact Poisson, ${evidence.arl.proposed.method})`,
      ],
      true,
    );
    header(sheet.getRow(r), ['Rate', 'Approved limits', 'Proposed limits']);
    r++;
    evidence.arl.approved.points.forEach((point, i) => {
      put([
        i === 0 ? 'in control' : `rate ×${point.shift}`,
        point.arl ?? 'never',
        evidence.arl!.proposed.points[i]?.arl ?? 'never',
      ]);
    });
  } else put([text(`No run lengths: ${evidence.arlNote ?? ''}`)]);
  r++;
  const step = evidence.changePoint;
  if (step) {
    put(['Check for one step in the rate (values)'], true);
    put(['Split between', text(`${step.lastBefore} and ${step.firstAfter}`)]);
    put(['Likelihood-ratio statistic G', step.statistic, 'Worsley (1986)']);
    put(['Monte Carlo p-value', step.pValue, '(1 + b)/(1 + R), conditional on the total']);
    put(['Replications R, seed, generator', step.replications, text(`seed ${step.seed}, ${step.generator}`)]);
  }

  // --- The approved revision's limits table and periods
  writeApprovedPeriods(sheet, change, periodsTop);
  sheet.getColumn(1).width = 34;
  sheet.getColumn(2).width = 18;
  sheet.getColumn(3).width = 40;
  for (const column of [4, 5, 6, 7, 8]) sheet.getColumn(column).width = 16;
}

function limitCells(
  row: ExcelJS.Row,
  column: number,
  result: AnalysisResult,
  cells: { rate: string; multiplier: string; sigmaZ: string },
  units: string,
  stated: { center: number; lcl: number | null; ucl: number },
  formula: Formula,
): void {
  const onCount = result.chart === 'c';
  const center = onCount ? `${cells.rate}*${units}` : cells.rate;
  if (result.limits === 'probability') {
    // No inverse Poisson in a spreadsheet: the core's exact limits, as values.
    row.getCell(column).value = formula(center, stated.center);
    row.getCell(column + 1).value = stated.lcl ?? none;
    row.getCell(column + 2).value = stated.ucl;
    return;
  }
  const spread = `${cells.multiplier}*${cells.sigmaZ}*SQRT(${onCount ? `${cells.rate}*${units}` : `${cells.rate}/${units}`})`;
  const c = row.getCell(column).address;
  row.getCell(column).value = formula(center, stated.center);
  row.getCell(column + 1).value = formula(`IF(${c}-${spread}>0,${c}-${spread},"${none}")`, stated.lcl);
  row.getCell(column + 2).value = formula(`${c}+${spread}`, stated.ucl);
}

function writeApprovedPeriods(sheet: ExcelJS.Worksheet, change: ChangeContent, top: number): void {
  const a = change.approved.result;
  sheet.getRow(top - 1).getCell(1).value = text(
    `Approved revision ${change.approved.number}: its periods, as frozen`,
  );
  sheet.getRow(top - 1).getCell(1).font = { bold: true };
  header(sheet.getRow(top), ['#', 'Period', 'Count', 'Units', 'Status', 'LCL', 'UCL']);
  a.periods.forEach((p, i) => {
    const row = sheet.getRow(top + 1 + i);
    row.getCell(1).value = i + 1;
    row.getCell(2).value = text(p.label);
    row.getCell(3).value = p.count;
    row.getCell(4).value = p.units;
    row.getCell(5).value = p.status;
    row.getCell(6).value = p.lcl ?? none;
    row.getCell(7).value = p.ucl;
  });
}

/** A user's words as a text cell: exceljs writes strings as strings, never as formulas. */
const text = (value: string) => value;

function header(row: ExcelJS.Row, names: string[]): void {
  names.forEach((name, i) => (row.getCell(i + 1).value = name));
  row.font = { bold: true, color: { argb: ink } };
  row.eachCell((cell) => (cell.fill = headerFill));
}
