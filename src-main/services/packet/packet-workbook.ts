import { createRequire } from 'node:module';
import type ExcelJS from 'exceljs';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { limitsTable } from './limits-table.js';
import type { PacketContent } from './packet-content.js';
import { addChangeSheet } from './change-sheet.js';
import { deflateStoredEntries } from './deflate-stored-zip.js';

/**
 * The packet's workbook: formulas a reviewer can read and recompute (no macros), with cached
 * values written too so that any reader shows numbers straight away.
 *
 * Limits holds Σx and Σk of the included rows (SUMIF over Data's status column), the rate
 * ū = Σx/Σk (or the known rate, an input), the multiplier L and, for Laney limits, σz from the
 * moving ranges in Data. Data's per-row center, UCL and LCL are live formulas on those cells.
 * Spreadsheets have no inverse Poisson, so probability limits are values with check cells beside
 * them (POISSON.DIST at the limit and one step inside, against α/2).
 *
 * Everything a user typed (labels, causes, names, notes) is written as text, never as a formula.
 */
// The workbook class alone: the package's index also loads its streaming readers and their zip
// library, which a packet never uses and which cost more start-up time than the whole workbook.
const Workbook = createRequire(import.meta.url)('exceljs/lib/doc/workbook.js') as typeof ExcelJS.Workbook;

export interface WorkbookOptions {
  /** Leave out the cached formula results (tests use this to force a recalculation). */
  withoutCachedValues?: boolean;
}

const ink = 'FF1F2933';
const headerFill: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFE9ECEE' } };
const none = 'none';

/** Cell addresses of the Limits sheet, used by Data's formulas and by the reader. */
export const limitsCells = {
  sumCount: 'B3',
  sumUnits: 'B4',
  rate: 'B5',
  multiplier: 'B6',
  sigmaZ: 'B7',
  alpha: 'B8',
  center: 'B9',
} as const;
const abs = (address: string) => `Limits!$${address[0]}$${address.slice(1)}`;

export async function buildWorkbook(content: PacketContent, options: WorkbookOptions = {}): Promise<Buffer> {
  const result = content.result;
  const book = new Workbook();
  book.creator = 'Limit Ledger';
  book.created = new Date(content.generatedAt);
  book.modified = book.created;
  book.calcProperties.fullCalcOnLoad = true;
  const cached = <T>(value: T) => (options.withoutCachedValues ? undefined : value);
  const formula = (text: string, value: number | string | boolean | null): ExcelJS.CellFormulaValue => {
    const resultValue = cached(value === null ? none : value);
    return resultValue === undefined ? { formula: text } : { formula: text, result: resultValue };
  };

  const n = result.periods.length;
  const last = n + 1;
  const data = book.addWorksheet('Data');
  const limits = book.addWorksheet('Limits');
  const probability = result.limits === 'probability';
  const laney = result.limits === 'laney';

  // --- Data
  const dataHeader = [
    '#',
    'Period',
    'Count',
    'Units',
    'Rate',
    'Status',
    'Center',
    'LCL',
    'UCL',
    'z',
    'Moving range',
    'Rules',
    'Source row',
  ];
  if (probability) dataHeader.push('UCL count', 'LCL count', 'μ = ū·k', 'UCL check', 'LCL check');
  header(data, dataHeader);
  const statusRange = `Data!$F$2:$F$${last}`;
  result.periods.forEach((p, i) => {
    const r = i + 2;
    const row = data.getRow(r);
    const onCount = result.chart === 'c';
    const centerFormula = onCount ? `${abs(limitsCells.rate)}*D${r}` : abs(limitsCells.rate);
    const mean = `(${abs(limitsCells.rate)}*D${r})`;
    row.getCell(1).value = i + 1;
    row.getCell(2).value = text(p.label);
    row.getCell(3).value = p.count;
    row.getCell(4).value = p.units;
    row.getCell(5).value = formula(`C${r}/D${r}`, p.rate);
    row.getCell(6).value = p.status;
    row.getCell(7).value = formula(centerFormula, p.center);
    if (probability) {
      const uclCount = onCount ? p.ucl : Math.round(p.ucl * p.units);
      const lclCount = p.lcl === null ? 0 : onCount ? p.lcl : Math.round(p.lcl * p.units);
      row.getCell(14).value = uclCount;
      row.getCell(15).value = lclCount;
      row.getCell(16).value = formula(mean, result.rate * p.units);
      const halfAlpha = `${abs(limitsCells.alpha)}/2`;
      row.getCell(17).value = formula(
        `AND(1-_xlfn.POISSON.DIST(N${r},P${r},TRUE())<=${halfAlpha},1-_xlfn.POISSON.DIST(N${r}-1,P${r},TRUE())>${halfAlpha})`,
        true,
      );
      row.getCell(18).value = formula(
        `IF(O${r}=0,_xlfn.POISSON.DIST(0,P${r},TRUE())>${halfAlpha},AND(_xlfn.POISSON.DIST(O${r},P${r},TRUE())>${halfAlpha},_xlfn.POISSON.DIST(O${r}-1,P${r},TRUE())<=${halfAlpha}))`,
        true,
      );
      row.getCell(9).value = formula(onCount ? `N${r}` : `N${r}/D${r}`, p.ucl);
      row.getCell(8).value = formula(
        onCount ? `IF(O${r}>0,O${r},"${none}")` : `IF(O${r}>0,O${r}/D${r},"${none}")`,
        p.lcl,
      );
    } else {
      const spread = `${abs(limitsCells.multiplier)}*${abs(limitsCells.sigmaZ)}*SQRT(${onCount ? mean : `${abs(limitsCells.rate)}/D${r}`})`;
      row.getCell(9).value = formula(`G${r}+${spread}`, p.ucl);
      row.getCell(8).value = formula(`IF(G${r}-${spread}>0,G${r}-${spread},"${none}")`, p.lcl);
    }
    row.getCell(10).value = formula(
      `(E${r}-${abs(limitsCells.rate)})/SQRT(${abs(limitsCells.rate)}/D${r})`,
      zValue(result, i),
    );
    row.getCell(11).value =
      i === 0
        ? ''
        : formula(
            `IF(AND(F${r}<>"excluded",F${r - 1}<>"excluded"),ABS(J${r}-J${r - 1}),"")`,
            movingRange(result, i) ?? '',
          );
    row.getCell(12).value = text(p.rules.join(', '));
    row.getCell(13).value = p.row;
  });
  data.columns.forEach(
    (column, i) => (column.width = [5, 16, 8, 8, 12, 10, 12, 12, 12, 10, 12, 16, 10][i] ?? 12),
  );
  data.views = [{ state: 'frozen', ySplit: 1 }];

  // --- Limits
  limits.getCell('A1').value = text(`Limits: ${content.title}`);
  limits.getCell('A1').font = { bold: true, size: 13, color: { argb: ink } };
  const rows: [string, ExcelJS.CellValue, string][] = [
    [
      'Σx, count of included periods',
      formula(`SUMIF(${statusRange},"<>excluded",Data!$C$2:$C$${last})`, result.totals.count),
      'sum of Count where Status is not "excluded"',
    ],
    [
      'Σk, units of included periods',
      formula(`SUMIF(${statusRange},"<>excluded",Data!$D$2:$D$${last})`, result.totals.units),
      'sum of Units where Status is not "excluded"',
    ],
    [
      'ū, rate per inspection unit',
      result.rateSource === 'known'
        ? result.rate
        : formula(`${limitsCells.sumCount}/${limitsCells.sumUnits}`, result.rate),
      result.rateSource === 'known'
        ? 'the known (standard) rate: an input'
        : '= Σx / Σk (not the mean of the rates)',
    ],
    ['L, multiplier', result.multiplier, 'input: the width of sigma and Laney limits'],
    [
      'σz',
      laney ? formula(`AVERAGE(Data!$K$3:$K$${last})/1.128`, result.sigmaZ ?? 1) : 1,
      laney ? 'Laney: mean moving range of z over adjacent included periods / 1.128' : 'not used (1)',
    ],
    [
      'α per point',
      result.alpha ?? 0,
      probability ? 'input: two-sided false-alarm probability per point' : 'not used',
    ],
    [
      'Center line',
      result.chart === 'c'
        ? formula(`${limitsCells.rate}*Data!$D$2`, result.center)
        : formula(limitsCells.rate, result.center),
      result.chart === 'c' ? 'c̄ = ū·k (count per period)' : 'ū (rate per unit)',
    ],
  ];
  limits.getCell('A2').value = 'Quantity';
  limits.getCell('B2').value = 'Value';
  limits.getCell('C2').value = 'How';
  styleHeader(limits.getRow(2));
  rows.forEach(([label, value, how], i) => {
    const row = limits.getRow(i + 3);
    row.getCell(1).value = label;
    row.getCell(2).value = value;
    row.getCell(3).value = how;
  });
  const tableTop = rows.length + 5;
  limits.getRow(tableTop - 1).getCell(1).value = 'Limits for each number of units k that occurs';
  limits.getRow(tableTop - 1).getCell(1).font = { bold: true };
  ['Units k', 'LCL', 'UCL'].forEach((h, i) => (limits.getRow(tableTop).getCell(i + 1).value = h));
  styleHeader(limits.getRow(tableTop));
  limitsTable(result).forEach((entry, i) => {
    const row = limits.getRow(tableTop + 1 + i);
    row.getCell(1).value = entry.units;
    row.getCell(2).value = entry.lcl ?? none;
    row.getCell(3).value = entry.ucl;
  });
  limits.getColumn(1).width = 34;
  limits.getColumn(2).width = 16;
  limits.getColumn(3).width = 60;
  addChangeSheet(book, content, formula);

  // --- Exclusions, Iterations, Checks, Sign-off, Audit
  table(
    book.addWorksheet('Exclusions'),
    ['Period', 'Cause', 'Description', 'Reference', 'Who', 'When'],
    content.exclusions.map((e) =>
      [e.label, e.cause.category, e.cause.description, e.cause.reference ?? '', e.who, e.when].map(text),
    ),
  );
  table(
    book.addWorksheet('Iterations'),
    ['Step', 'Excluded', 'Center', 'LCL at k̄', 'UCL at k̄', 'Signals'],
    content.iterations.map((it, i) => [
      i + 1,
      text(it.excluded.join(', ')),
      it.center,
      it.lcl ?? none,
      it.ucl,
      text(it.signals.join(', ')),
    ]),
  );
  const checks = book.addWorksheet('Checks');
  const included = `(${statusRange}<>"excluded")`;
  const expected = `(Data!$D$2:$D$${last}*${abs(limitsCells.rate)})`;
  table(
    checks,
    ['Check', 'Value', 'How'],
    [
      [
        'Dispersion D',
        formula(
          `SUMPRODUCT(${included}*(Data!$C$2:$C$${last}-${expected})^2/${expected})`,
          result.dispersion.statistic,
        ),
        'Σ(x − kū)²/(kū) over included periods',
      ],
      [
        'Degrees of freedom',
        result.dispersion.df,
        result.rateSource === 'known' ? 'm (known rate)' : 'm − 1',
      ],
      [
        'P(χ² ≥ D)',
        formula('_xlfn.CHISQ.DIST.RT(B2,B3)', result.dispersion.pOver),
        'small means over-dispersed',
      ],
      ['P(χ² ≤ D)', result.dispersion.pUnder, 'small means under-dispersed'],
      [
        'Periods expecting < 5',
        result.dispersion.smallExpected,
        'the χ² approximation is poor when many are',
      ],
      ['Phase I false-alarm probability', result.fap, '1 − Π(1 − aᵢ) over included periods'],
      ['Rate interval, lower (95 %)', result.rateInterval.lower, 'exact (Garwood)'],
      ['Rate interval, upper (95 %)', result.rateInterval.upper, 'exact (Garwood)'],
      ...result.warnings.map((w) => [text(w.code), text(w.message), ''] as ExcelJS.CellValue[]),
    ],
  );
  table(
    book.addWorksheet('Sign-off'),
    ['Printed name', 'Role', 'Meaning', 'Date and time', 'Certificate SHA-256', 'Self-issued', 'State'],
    content.signOffs.map((s) => [
      text(s.printedName),
      text(s.role),
      s.meaning,
      s.time,
      s.fingerprint,
      s.selfIssued ? 'yes' : 'no',
      text(s.state === 'valid' ? 'valid' : `${s.state}: ${s.note ?? ''}`),
    ]),
  );
  const signOffSheet = book.getWorksheet('Sign-off')!;
  const revisionTop = content.signOffs.length + 4;
  const revisionRows: [string, string][] = [
    ['Revision', `${content.revision.number} (${content.revision.status})`],
    ['Effective date', content.revision.effectiveDate ?? ''],
    ['Review date', content.revision.reviewDate ?? ''],
    ['Reaction plan', content.revision.reactionPlan ?? ''],
    ['Study id', content.studyId],
  ];
  revisionRows.forEach(([label, value], i) => {
    signOffSheet.getRow(revisionTop + i).getCell(1).value = label;
    signOffSheet.getRow(revisionTop + i).getCell(2).value = text(value);
  });
  table(
    book.addWorksheet('Audit'),
    ['Seq', 'Time (local clock)', 'Who', 'What', 'Hash'],
    content.audit.map((a) => [a.seq, a.time, text(a.who), text(a.what), a.hash]),
  );

  // Written stored, then deflated by Node's zlib rather than exceljs's JavaScript deflate.
  return deflateStoredEntries(new Uint8Array(await book.xlsx.writeBuffer({ zip: { compression: 'STORE' } })));
}

/** A user's words as a text cell: exceljs writes strings as strings, never as formulas. */
const text = (value: string) => value;

function header(sheet: ExcelJS.Worksheet, names: string[]): void {
  names.forEach((name, i) => (sheet.getRow(1).getCell(i + 1).value = name));
  styleHeader(sheet.getRow(1));
}

function styleHeader(row: ExcelJS.Row): void {
  row.font = { bold: true, color: { argb: ink } };
  row.eachCell((cell) => (cell.fill = headerFill));
}

function table(sheet: ExcelJS.Worksheet, names: string[], rows: ExcelJS.CellValue[][]): void {
  header(sheet, names);
  rows.forEach((values, i) =>
    values.forEach((value, j) => (sheet.getRow(i + 2).getCell(j + 1).value = value)),
  );
  sheet.columns.forEach((column) => (column.width = 18));
}

const zValue = (result: AnalysisResult, i: number) => {
  const p = result.periods[i]!;
  return (p.rate - result.rate) / Math.sqrt(result.rate / p.units);
};

function movingRange(result: AnalysisResult, i: number): number | null {
  const [a, b] = [result.periods[i - 1]!, result.periods[i]!];
  return a.status !== 'excluded' && b.status !== 'excluded'
    ? Math.abs(zValue(result, i) - zValue(result, i - 1))
    : null;
}

/** What a workbook states: the center and each row's limits, read from its (cached) values. */
export interface WorkbookStatement {
  center: number | null;
  rate: number | null;
  periods: { label: string; lcl: number | null; ucl: number | null }[];
  /** Probability limits: every check cell holds TRUE. */
  checksHold: boolean | null;
  dispersion: { statistic: number | null; pOver: number | null };
}

export async function readWorkbookStatement(bytes: Uint8Array): Promise<WorkbookStatement> {
  const book = new Workbook();
  // exceljs's types want its own Buffer flavor.
  await book.xlsx.load(Buffer.from(bytes) as unknown as ExcelJS.Buffer);
  const data = book.getWorksheet('Data');
  const limits = book.getWorksheet('Limits');
  if (!data || !limits) throw new Error('the workbook has no Data or Limits sheet');
  const numberOrNull = (cell: ExcelJS.Cell): number | null => {
    const value = cellValue(cell);
    return typeof value === 'number' ? value : null;
  };
  const periods: WorkbookStatement['periods'] = [];
  let checksHold: boolean | null = null;
  data.eachRow((row, r) => {
    if (r === 1) return;
    periods.push({
      label: String(cellValue(row.getCell(2)) ?? ''),
      lcl: numberOrNull(row.getCell(8)),
      ucl: numberOrNull(row.getCell(9)),
    });
    if (data.getRow(1).getCell(17).value === 'UCL check') {
      const holds = cellValue(row.getCell(17)) === true && cellValue(row.getCell(18)) === true;
      checksHold = (checksHold ?? true) && holds;
    }
  });
  const checks = book.getWorksheet('Checks');
  return {
    center: numberOrNull(limits.getCell(limitsCells.center)),
    rate: numberOrNull(limits.getCell(limitsCells.rate)),
    periods,
    checksHold,
    dispersion: {
      statistic: checks ? numberOrNull(checks.getCell('B2')) : null,
      pOver: checks ? numberOrNull(checks.getCell('B4')) : null,
    },
  };
}

function cellValue(cell: ExcelJS.Cell): unknown {
  const value = cell.value;
  if (value !== null && typeof value === 'object' && 'formula' in value)
    return (value as ExcelJS.CellFormulaValue).result;
  if (value !== null && typeof value === 'object' && 'sharedFormula' in value)
    return (value as ExcelJS.CellSharedFormulaValue).result;
  return value;
}
