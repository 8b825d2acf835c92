// `npm run bench`: speed figures as ratios measured in one run, on this machine, now.
// Every figure is the best of a few runs (the least disturbed by other work on the machine).
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { processSecondsInTurn, repeats } from './bench-process.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const dist = (path) => join(root, 'dist', path);
const { analyzePhaseOne } = await import(dist('shared-core/study/phase-one.js'));
const { defaultOptions } = await import(dist('shared-core/study/analysis-types.js'));
const { poissonQuantile, poissonUpperQuantile } = await import(dist('shared-core/stats/poisson.js'));

const sizes = (process.env.LL_BENCH_SIZES ?? '10000,100000,1000000').split(',').map(Number);
const work = mkdtempSync(join(tmpdir(), 'limit-ledger-bench-'));

/** A seeded generator, so that every run measures the same data. */
function generator(seed) {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

function poissonDraw(random, mean) {
  let count = 0;
  let product = random();
  const limit = Math.exp(-mean);
  while (product > limit) {
    count++;
    product *= random();
  }
  return count;
}

function writeHistory(periods) {
  const random = generator(periods);
  const rows = ['lot,count,units'];
  const observations = [];
  for (let i = 0; i < periods; i++) {
    const units = 8 + Math.floor(random() * 5);
    const count = poissonDraw(random, 0.6 * units);
    rows.push(`L${i + 1},${count},${units}`);
    observations.push({ label: `L${i + 1}`, row: i + 2, count, units });
  }
  const file = join(work, `history-${periods}.csv`);
  writeFileSync(file, rows.join('\n') + '\n');
  return { file, observations };
}

function best(run) {
  let fastest = Infinity;
  for (let i = 0; i < repeats; i++) {
    const start = process.hrtime.bigint();
    run();
    fastest = Math.min(fastest, Number(process.hrtime.bigint() - start) / 1e9);
  }
  return fastest;
}

// The floor every CSV tool stands on: start node, read the file, split it, sum one column.
const bareReadAndSum = `
const text = require('fs').readFileSync(process.argv[1], 'utf8');
let sum = 0;
for (const line of text.split('\\n').slice(1)) if (line) sum += Number(line.split(',')[1]);
process.stdout.write(String(sum));`;

const seconds = (s) => (s < 1 ? `${(s * 1000).toFixed(1)} ms` : `${s.toFixed(2)} s`);
const table = (title, header, rows) => {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => String(r[i]).length)));
  const line = (cells) => cells.map((c, i) => String(c).padStart(widths[i])).join('  ');
  console.log(`\n${title}\n${line(header)}\n${rows.map(line).join('\n')}`);
};

try {
  const rows = [];
  for (const periods of sizes) {
    const { file, observations } = writeHistory(periods);
    // The processes first, while this one is quiet: the in-process analysis leaves garbage whose
    // collection would run on the machine's cores beside them.
    const [bare, cli] = processSecondsInTurn([
      ['-e', bareReadAndSum, file],
      [
        join(root, 'bin/limit-ledger.js'),
        'analyze',
        file,
        '--count',
        'count',
        '--units',
        'units',
        '--label',
        'lot',
        '--json',
      ],
    ]);
    const core = best(() => analyzePhaseOne(observations, [], defaultOptions));
    rows.push([
      periods.toLocaleString('en-US'),
      seconds(bare.wall),
      seconds(core),
      `${(core / bare.wall).toFixed(2)}×`,
      seconds(cli.wall),
      `${(cli.wall / bare.wall).toFixed(2)}×`,
      `${(cli.cpu / bare.cpu).toFixed(2)}×`,
    ]);
  }
  table(
    'Phase I analysis (u chart, sigma limits, rule beyond); ratios to a bare read-and-sum of the same CSV in node',
    [
      'periods',
      'read-and-sum',
      'core analysis',
      'core ÷ bare',
      'analyze --json',
      'analyze ÷ bare',
      'same, CPU time',
    ],
    rows,
  );
  console.log('target: analyze --json on 100,000 periods within 3× the bare read-and-sum');

  const quantileRows = [1, 100, 1e6].map((mean) => {
    const random = generator(7);
    let evaluations = 0;
    const start = process.hrtime.bigint();
    let elapsed = 0;
    while (elapsed < 0.4) {
      for (let i = 0; i < 200; i++) {
        poissonUpperQuantile(0.00135 * (0.5 + random()), mean);
        poissonQuantile(0.00135 * (0.5 + random()), mean);
      }
      evaluations += 400;
      elapsed = Number(process.hrtime.bigint() - start) / 1e9;
    }
    return [mean.toLocaleString('en-US'), Math.round(evaluations / elapsed).toLocaleString('en-US')];
  });
  table('Exact Poisson quantiles (upper and lower tails)', ['mean', 'evaluations per second'], quantileRows);

  // Benchmarks of the other parts, each in its own module beside this one.
  for (const [name, exportName, title] of [
    ['bench-import.js', 'benchImport', 'Import (100,000 rows)'],
    ['bench-study.js', 'benchStudy', 'Study document (100,000 observations, 1,000 audit events)'],
    ['bench-packet.js', 'benchPacket', 'Approval packet (PDF + workbook + signature, whole process)'],
    ['bench-screens.js', 'benchScreens', 'Screens, measured in the page'],
  ]) {
    const path = join(root, 'scripts', name);
    if (!existsSync(path)) continue;
    try {
      const module = await import(path);
      const results = await module[exportName]();
      if (results.length === 0) continue;
      const header = Object.keys(results[0]);
      table(
        title,
        header,
        results.map((r) =>
          header.map((h) => (typeof r[h] === 'number' ? Number(r[h].toPrecision(4)) : r[h])),
        ),
      );
    } catch (error) {
      console.log(`\n${title}: not measured (${error.message})`);
    }
  }
} finally {
  rmSync(work, { recursive: true, force: true });
}
