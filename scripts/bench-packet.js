// `npm run bench` part: `limit-ledger packet` (signed PDF + workbook + limits exports) as a whole
// process, for studies of 50, 500 and 5,000 periods. Includes starting Node, loading the modules,
// opening the key (PBKDF2 with 600,000 iterations) and writing the files. Target: 500 periods
// within 1.5 s. The sizes are run in turn, round by round, with an empty node process among them:
// its row shows what Node's own start costs on this machine now. CPU seconds are of all threads.
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { processSecondsInTurn } from './bench-process.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const load = (file) => import(pathToFileURL(join(root, 'dist', file)).href);
const cli = join(root, 'bin', 'limit-ledger.js');
const sizes = [50, 500, 5000];

export async function benchPacket() {
  const { newStudy } = await load('shared-core/study/new-study.js');
  const { saveStudyFile } = await load('src-main/services/study-file.js');
  const { addSignOff } = await load('src-main/services/signing/sign-off.js');
  const { createPersonalIdentity, personalKeyFileText } = await load(
    'src-main/services/signing/personal-certificate.js',
  );
  const { writeOwnerOnly } = await load('src-main/services/signing/key-file.js');
  const work = mkdtempSync(join(tmpdir(), 'limit-ledger-bench-packet-'));
  try {
    const passphrase = 'bench passphrase, not a secret';
    const identity = await createPersonalIdentity({ name: 'Bench Signer (invented)' });
    const keyPath = join(work, 'bench.key');
    await writeOwnerOnly(keyPath, await personalKeyFileText(identity, passphrase));
    const env = { ...process.env, LL_BENCH_PASS: passphrase };
    const commands = [['-e', '']];
    for (const periods of sizes) {
      // Invented counts: a benchmark load, not data.
      const observations = Array.from({ length: periods }, (_, i) => ({
        label: `P${i + 1}`,
        row: i + 2,
        count: (i * 7 + 3) % 13,
        units: 40 + (i % 3) * 10,
      }));
      const study = newStudy({
        id: `bench-${periods}`,
        identity: {
          part: 'Invented bench part',
          processStep: 'bench',
          characteristic: 'flaws',
          inspectionUnit: 'one unit',
          owner: 'bench',
          demo: true,
        },
        source: { file: 'bench.csv', sha256: '0'.repeat(64), importSettings: {}, importReport: {} },
        observations,
        method: { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
        who: 'bench',
        now: '2026-12-01T10:00:00.000+00:00',
      });
      const signed = addSignOff(study, identity, {
        printedName: 'Bench Signer',
        role: 'bench',
        meaning: 'prepared',
        now: '2026-12-01T10:00:01.000+00:00',
      });
      if (!signed.ok) throw new Error(JSON.stringify(signed.findings));
      const studyPath = join(work, `bench-${periods}.ledger`);
      const saved = await saveStudyFile(studyPath, signed.value.study);
      if (!saved.ok) throw new Error(JSON.stringify(saved.findings));
      commands.push([
        cli,
        'packet',
        studyPath,
        '--pdf',
        join(work, `bench-${periods}.pdf`),
        '--xlsx',
        join(work, `bench-${periods}.xlsx`),
        '--p12',
        keyPath,
        '--passphrase-env',
        'LL_BENCH_PASS',
      ]);
    }
    const [empty, ...packets] = processSecondsInTurn(commands, env);
    const base = packets[0].wall;
    return [
      { name: 'node, empty process', seconds: empty.wall, 'CPU seconds': empty.cpu, 'PDF KiB': 0 },
      ...packets.map((best, i) => ({
        name: `packet, ${sizes[i].toLocaleString('en-US')} periods`,
        seconds: best.wall,
        'CPU seconds': best.cpu,
        'PDF KiB': Math.round(statSync(join(work, `bench-${sizes[i]}.pdf`)).size / 1024),
      })),
    ].map((row) => ({ ...row, 'relative to 50 periods': row.seconds / base }));
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  console.table(await benchPacket());
}
