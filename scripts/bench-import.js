// `npm run bench` part: import of a 100,000-row CSV and a 100,000-row XLSX, each in a child process
// so that its peak memory (max RSS) is its own, against a plain parse of the same file (papaparse
// for the CSV, exceljs for the workbook): the ratio is what decoding checks, validation and the
// import report cost. The data are invented counts of an invented line, a benchmark load only.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = fileURLToPath(import.meta.url);
const dist = join(dirname(here), '..', 'dist');
const load = (file) => import(pathToFileURL(join(dist, file)).href);
const rows = Number(process.env.LL_BENCH_IMPORT_ROWS ?? 100_000);
const request = { count: 'defects', units: 'boards', label: 'lot', date: 'day' };
// Without a date column the one-pass reader takes the file (dates go the general way).
const undatedRequest = { count: 'defects', units: 'boards', label: 'lot' };

function history(n) {
  const lines = ['lot,day,defects,boards'];
  for (let i = 0; i < n; i++) {
    const day = new Date(Date.UTC(2000, 0, 1) + i * 86_400_000).toISOString().slice(0, 10);
    lines.push(`L${i + 1},${day},${(i * 7919) % 13},${40 + (i % 21)}`);
  }
  return lines;
}

async function writeWorkbook(path, lines) {
  const { default: ExcelJS } = await import('exceljs');
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: path, useSharedStrings: false });
  const sheet = workbook.addWorksheet('Data');
  sheet.addRow(lines[0].split(',')).commit();
  for (const line of lines.slice(1)) {
    const [lot, day, defects, boards] = line.split(',');
    sheet.addRow([lot, new Date(`${day}T00:00:00Z`), Number(defects), Number(boards)]).commit();
  }
  sheet.commit();
  await workbook.commit();
}

/** Runs one measurement in a fresh process: its time and its own peak resident memory. */
function measure(kind, path) {
  const output = execFileSync(process.execPath, [here, '--child', kind, path], { encoding: 'utf8' });
  return JSON.parse(output);
}

async function child(kind, path) {
  const bytes = kind === 'idle' ? null : readFileSync(path);
  const { importBytes } = await load('src-main/services/import/import-file.js');
  const Papa = (await import('papaparse')).default;
  const { default: ExcelJS } = await import('exceljs');
  const start = process.hrtime.bigint();
  if (kind === 'import' || kind === 'import-undated') {
    const result = await importBytes(
      path,
      new Uint8Array(bytes),
      kind === 'import' ? request : undatedRequest,
    );
    if (!result.ok || result.value.observations.length !== rows)
      throw new Error('the benchmark import failed');
  } else if (kind === 'plain-csv') {
    Papa.parse(bytes.toString('utf8'));
  } else if (kind === 'plain-xlsx') {
    await new ExcelJS.Workbook().xlsx.load(bytes);
  }
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  process.stdout.write(JSON.stringify({ seconds, peakMB: process.resourceUsage().maxRSS / 1024 }));
}

export async function benchImport() {
  const work = mkdtempSync(join(tmpdir(), 'limit-ledger-bench-import-'));
  try {
    const lines = history(rows);
    const csv = join(work, 'history.csv');
    writeFileSync(csv, lines.join('\n') + '\n');
    const undated = join(work, 'history-undated.csv');
    writeFileSync(
      undated,
      lines
        .map((line) =>
          line
            .split(',')
            .filter((_, i) => i !== 1)
            .join(','),
        )
        .join('\n') + '\n',
    );
    const xlsx = join(work, 'history.xlsx');
    await writeWorkbook(xlsx, lines);
    const idle = measure('idle', csv);
    const results = [
      {
        name: 'node with the importer loaded, idle',
        seconds: 0,
        peakMB: idle.peakMB,
        fileMB: 0,
        timeVsPlainParse: 1,
      },
    ];
    for (const [name, path, plain, kind] of [
      [`CSV, ${rows.toLocaleString('en-US')} rows`, csv, 'plain-csv', 'import'],
      [
        `CSV without dates (one-pass reader), ${rows.toLocaleString('en-US')} rows`,
        undated,
        'plain-csv',
        'import-undated',
      ],
      [`XLSX, ${rows.toLocaleString('en-US')} rows`, xlsx, 'plain-xlsx', 'import'],
    ]) {
      const runs = [0, 1, 2].map(() => measure(kind, path));
      const fastest = Math.min(...runs.map((run) => run.seconds));
      const peakMB = Math.max(...runs.map((run) => run.peakMB));
      const baseline = Math.min(...[0, 1, 2].map(() => measure(plain, path).seconds));
      results.push({
        name,
        seconds: fastest,
        peakMB,
        fileMB: statSync(path).size / 1024 / 1024,
        timeVsPlainParse: fastest / baseline,
      });
    }
    return results;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

if (process.argv[1] === here && process.argv[2] === '--child') {
  await child(process.argv[3], process.argv[4]);
} else if (process.argv[1] === here) {
  console.table(await benchImport());
}
