// `npm run bench` part: save and open of a study with 100,000 observations and 1,000 audit events,
// against a plain JSON.stringify + write and read + JSON.parse of the same document (the ratio is
// what checking, hashing, canonical ordering and the atomic, flushed write cost).
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const dist = join(dirname(fileURLToPath(import.meta.url)), '..', 'dist');
const load = (file) => import(pathToFileURL(join(dist, file)).href);

const best = async (runs, task) => {
  let fastest = Infinity;
  for (let i = 0; i < runs; i++) {
    const start = process.hrtime.bigint();
    await task();
    fastest = Math.min(fastest, Number(process.hrtime.bigint() - start) / 1e9);
  }
  return fastest;
};

export async function benchStudy() {
  const { newStudy } = await load('shared-core/study/new-study.js');
  const { appendEvent } = await load('shared-core/study/audit-chain.js');
  const { saveStudyFile, openStudyFile } = await load('src-main/services/study-file.js');

  // Invented counts: a benchmark load, not data.
  const observations = Array.from({ length: 100_000 }, (_, i) => ({
    label: `P${i + 1}`,
    row: i + 2,
    count: (i * 7919) % 13,
    units: 40 + (i % 21),
    date: new Date(Date.UTC(2020, 0, 1) + i * 3_600_000).toISOString().slice(0, 10),
  }));
  const time = (i) => new Date(Date.UTC(2026, 0, 5, 8) + i * 1000).toISOString();
  let study = newStudy({
    id: '00000000-0000-4000-8000-000000000bench',
    identity: {
      part: 'bench part (invented)',
      processStep: 'bench',
      characteristic: 'marks',
      inspectionUnit: 'one part',
      owner: 'bench',
    },
    source: { file: 'bench.csv', sha256: '0'.repeat(64), importSettings: {}, importReport: {} },
    observations,
    method: { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
    who: 'bench',
    now: time(0),
  });
  for (let i = study.events.length; i < 1000; i++) {
    const index = (i * 97) % observations.length;
    study = appendEvent(
      study,
      i % 2 === 0
        ? { type: 'note-added', who: 'bench', payload: { index, label: `P${index + 1}`, text: `note ${i}` } }
        : {
            type: 'excluded',
            who: 'bench',
            payload: {
              index,
              label: `P${index + 1}`,
              cause: { category: 'bench', description: `cause ${i}` },
            },
          },
      time(i),
    );
  }

  const folder = mkdtempSync(join(tmpdir(), 'll-bench-study-'));
  try {
    const path = join(folder, 'bench.ledger');
    const plain = join(folder, 'plain.json');
    let diskHash = null;
    const save = await best(3, async () => {
      const saved = await saveStudyFile(path, study, { expectedDiskHash: diskHash });
      if (!saved.ok) throw new Error(saved.findings[0].message);
      diskHash = saved.value.diskHash;
    });
    const open = await best(3, async () => {
      const opened = await openStudyFile(path);
      if (!opened.ok || opened.value.readOnly) throw new Error('the bench study did not open cleanly');
    });
    const plainWrite = await best(3, async () => writeFileSync(plain, JSON.stringify(study)));
    const plainRead = await best(3, async () => JSON.parse(readFileSync(plain, 'utf8')));
    const megabytes = statSync(path).size / 1e6;
    return [
      {
        step: `save (${megabytes.toFixed(1)} MB: verify, canonical text, temp + fsync + rename)`,
        seconds: save,
        'ratio to plain JSON': save / plainWrite,
      },
      {
        step: 'open (parse, schema, verify chain and data)',
        seconds: open,
        'ratio to plain JSON': open / plainRead,
      },
      { step: 'plain JSON.stringify + write (baseline)', seconds: plainWrite, 'ratio to plain JSON': 1 },
      { step: 'plain read + JSON.parse (baseline)', seconds: plainRead, 'ratio to plain JSON': 1 },
    ];
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  console.table(await benchStudy());
}
