import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli, tempFiles } from './helpers/cli.js';

// Invented inspection histories of an invented plant: every file says the same thing in a
// different format, so every import must give the same periods.
const counts = [3, 1, 4, 1, 5, 2, 6, 2, 3, 5];
const boards = [50, 48, 50, 52, 50, 49, 50, 51, 50, 50];
const rate = counts.reduce((a, b) => a + b, 0) / boards.reduce((a, b) => a + b, 0); // ū = Σx / Σk

const dir = tempFiles({
  'comma.csv':
    ['lot,defects,boards', ...counts.map((c, i) => `L${i + 1},${c},${boards[i]}`)].join('\n') + '\n',
  'semicolon.csv':
    ['Los;Fehler;Platten', ...counts.map((c, i) => `L${i + 1};${c};${boards[i]},0`)].join('\r\n') + '\r\n',
  'bad.csv': 'lot,defects,boards\nL1,3,50\nL2,2.5,50\nL3,1,0\nL4,,50\n',
  'dates.csv': 'day,defects\n03/04/2026,1\n04/04/2026,2\n',
  'events.csv':
    'when,defect\n2026-03-02 07:00,bridge\n2026-03-02 08:00,void\n2026-03-03 09:00,bridge\n2026-03-05 10:00,bridge\n',
});

beforeAll(async () => {
  const utf16 = Buffer.concat([
    Buffer.from([0xff, 0xfe]),
    Buffer.from(readFileSync(join(dir, 'comma.csv'), 'utf8').replaceAll(',', '\t'), 'utf16le'),
  ]);
  writeFileSync(join(dir, 'unicode.txt'), utf16);
  const workbook = new ExcelJS.Workbook();
  workbook.addWorksheet('Read me').addRow(['Invented data']);
  const sheet = workbook.addWorksheet('Inspection log');
  sheet.addRow(['lot', 'defects', 'boards']);
  counts.forEach((c, i) => sheet.addRow([`L${i + 1}`, c, boards[i]]));
  const units = workbook.addWorksheet('Units');
  units.addRow(['day', 'boards']);
  ['2026-03-02', '2026-03-03', '2026-03-04', '2026-03-05'].forEach((day) => units.addRow([day, 40]));
  const events = workbook.addWorksheet('Events');
  events.addRow(['when', 'defect']);
  events.addRow([new Date(Date.UTC(2026, 2, 2, 7)), 'bridge']);
  events.addRow([new Date(Date.UTC(2026, 2, 2, 8)), 'void']);
  events.addRow([new Date(Date.UTC(2026, 2, 5, 9)), 'bridge']);
  writeFileSync(join(dir, 'history.xlsx'), new Uint8Array(await workbook.xlsx.writeBuffer()));
});

async function analyzeJson(args: string[]) {
  const run = await runCli(['analyze', ...args, '--json']);
  expect(run.stderr).toBe('');
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout);
}

describe('limit-ledger analyze reads every format to the same periods', () => {
  it.each([
    ['comma.csv', ['--count', 'defects', '--units', 'boards', '--label', 'lot']],
    ['semicolon.csv', ['--count', 'Fehler', '--units', 'Platten', '--label', 'Los']],
    ['unicode.txt', ['--count', 'defects', '--units', 'boards', '--label', 'lot']],
    ['history.xlsx', ['--count', 'defects', '--units', 'boards', '--label', 'lot']],
  ])('%s', async (name, flags) => {
    const out = await analyzeJson([join(dir, name), ...flags]);
    expect(out.periods.map((p: { count: number }) => p.count)).toEqual(counts);
    expect(out.periods.map((p: { units: number }) => p.units)).toEqual(boards);
    expect(out.center).toBeCloseTo(rate, 12);
    expect(out.import.sha256).toBe(
      createHash('sha256')
        .update(readFileSync(join(dir, name)))
        .digest('hex'),
    );
    expect(out.import.rowsRead).toBe(10);
  });

  it('says which settings it detected', async () => {
    const out = await analyzeJson([join(dir, 'semicolon.csv'), '--count', 'Fehler', '--units', 'Platten']);
    expect(out.import.settings).toMatchObject({ delimiter: ';', decimal: 'comma', encoding: 'utf-8' });
    expect(out.import.changedCells).toHaveLength(10); // "50,0" read as 50
    const sheet = await analyzeJson([join(dir, 'history.xlsx'), '--count', 'defects', '--units', 'boards']);
    expect(sheet.import.settings.sheet).toBe('Inspection log');
  });
});

describe('limit-ledger analyze: bad input', () => {
  it('stops with status 2 and names file, row and column of every bad cell', async () => {
    const run = await runCli(['analyze', join(dir, 'bad.csv'), '--count', 'defects', '--units', 'boards']);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain(
      'bad.csv, row 3, column "defects": "2.5" is not a whole number of nonconformities',
    );
    expect(run.stderr).toContain('bad.csv, row 4, column "boards"');
    expect(run.stderr).toContain(
      'bad.csv, row 5, column "defects": the cell is blank; a blank is never read as 0',
    );
  });

  it('names the sheet of a workbook in its messages', async () => {
    const run = await runCli(['analyze', join(dir, 'history.xlsx'), '--sheet', 'Units', '--count', 'day']);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain(
      'history.xlsx, sheet "Units", row 2, column "day": "2026-03-02" is not a number',
    );
  });

  it('asks for the date order instead of guessing', async () => {
    const run = await runCli(['analyze', join(dir, 'dates.csv'), '--count', 'defects', '--date', 'day']);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain('dates.csv, row 2, column "day": "03/04/2026" could be 3 April or March 4');
    const out = await analyzeJson([
      join(dir, 'dates.csv'),
      '--count',
      'defects',
      '--date',
      'day',
      '--date-order',
      'dmy',
    ]);
    expect(out.import.settings).toMatchObject({ dateOrder: 'dmy', dateOrderSource: 'given' });
  });

  it('refuses a flag value it does not know, naming the choices', async () => {
    const run = await runCli(['analyze', join(dir, 'comma.csv'), '--count', 'defects', '--decimal', 'dot']);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain('--decimal dot: use comma or point');
  });
});

describe('limit-ledger analyze --events', () => {
  it('groups an event list by day and reports the grouping', async () => {
    const out = await analyzeJson([
      join(dir, 'events.csv'),
      '--events',
      '--period',
      'day',
      '--time',
      'when',
      '--category',
      'defect',
    ]);
    expect(out.periods.map((p: { label: string; count: number }) => [p.label, p.count])).toEqual([
      ['2026-03-02', 2],
      ['2026-03-03', 1],
      ['2026-03-05', 1],
    ]);
    expect(out.periods[0].rows).toEqual([2, 3]);
    expect(out.import.settings.events).toMatchObject({ period: 'day', time: 'when', category: 'defect' });
    expect(out.import.categories).toEqual([
      { category: 'bridge', count: 3 },
      { category: 'void', count: 1 },
    ]);
  });

  it('takes units per day from a second sheet, which brings the days without events', async () => {
    const out = await analyzeJson([
      join(dir, 'history.xlsx'),
      ...['--sheet', 'Events', '--events', '--period', 'day', '--time', 'when'],
      ...['--units-sheet', 'Units', '--units', 'boards', '--units-key', 'day'],
    ]);
    expect(
      out.periods.map((p: { label: string; count: number; units: number }) => [p.label, p.count, p.units]),
    ).toEqual([
      ['2026-03-02', 2, 40],
      ['2026-03-03', 0, 40],
      ['2026-03-04', 0, 40],
      ['2026-03-05', 1, 40],
    ]);
    expect(out.import.unitsTable).toMatchObject({ rowsRead: 4, accepted: 4 });
  });
});
