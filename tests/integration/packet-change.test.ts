import { readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstNewPeriod, proposeChange } from '../../shared-core/changes/propose-change.js';
import { rateRatioTest } from '../../shared-core/changes/rate-ratio-test.js';
import { approvedBaseline } from '../../shared-core/changes/approved-baseline.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';
import { addPeriods } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { formatStudy } from '../../shared-core/study/study-text.js';
import { buildWorkbook } from '../../src-main/services/packet/packet-workbook.js';
import { changeCells } from '../../src-main/services/packet/change-sheet.js';
import { packetContent } from '../../src-main/services/packet/packet-from-study.js';
import { ratioShown, shownProbability } from '../../src-main/services/packet/packet-words.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import { addSignOff, revisionAnalysis } from '../../src-main/services/signing/sign-off.js';
import { readPkcs12 } from '../../src-main/services/signing/pkcs12-identity.js';
import { makeP12 } from '../unit/signing-fixtures.js';
import { runCli } from './helpers/cli.js';
import { signedDemoStudy, writeStudy } from './packet-study.js';
import { recalculateWithLibreOffice, run, scratch } from './packet-tools.js';

/**
 * A change packet end to end: the invented demo study approved by two keys, new periods added
 * (invented counts, after a burner change at the invented plant), a change proposed with the lead's
 * core and signed as prepared; `limit-ledger packet` makes the packet, `limit-ledger verify` checks
 * it, pdftotext reads the change section, LibreOffice recomputes the Change sheet.
 *
 * The ratio, interval and p-value printed are checked against `rateRatioTest` computed here from
 * the counts of each study; tests/reference/changes-rate-ratio.test.ts checks `rateRatioTest`
 * against @stdlib and a published example, and the p-value of this very case is summed again here
 * from @stdlib's binomial pmf.
 */
const folder = scratch('packet-change');
const now = (hour: number, minute = 0) =>
  `2026-11-2${hour < 24 ? 2 : 3}T${String(hour % 24).padStart(2, '0')}:${String(minute).padStart(2, '0')}:00.000+01:00`;
let study: Study;
let studyPath: string;
let pdfPath: string;
let xlsxPath: string;
let p12: ReturnType<typeof makeP12>;
let pdfText: string;

// Invented: 14 shifts of 40 panels after the burner change, with fewer blemishes than before.
const newCounts = [1, 0, 2, 1, 0, 1, 1, 0, 2, 0, 1, 1, 0, 1];
const newPeriods: Observation[] = newCounts.map((count, i) => ({
  label: `N${String(i + 1).padStart(2, '0')}`,
  row: i + 2,
  count,
  units: 40,
}));

beforeAll(async () => {
  p12 = makeP12(folder, 'approver', 'rsa', 'Dana Okafor');
  const approver = readPkcs12(readFileSync(p12.path), p12.passphrase, 'approver.p12');
  const preparer = await createPersonalIdentity({ name: 'Rui Tanaka' });
  const current = signedDemoStudy(preparer, approver);
  const added = addPeriods(
    current,
    { who: 'Rui Tanaka', file: 'after-burner.csv', sourceSha256: 'c'.repeat(64), observations: newPeriods },
    now(9),
  );
  if (!added.ok) throw new Error(JSON.stringify(added.findings));
  const proposed = proposeChange(
    added.value,
    {
      who: 'Rui Tanaka',
      category: 'process-change',
      // A reason that starts like a formula must stay text in the workbook.
      reason: '=HYPERLINK("http://example.invalid") burner controls replaced on oven 2 (invented)',
      firstIndex: firstNewPeriod(added.value),
    },
    now(10),
  );
  if (!proposed.ok) throw new Error(JSON.stringify(proposed.findings));
  const prepared = addSignOff(proposed.value, preparer, {
    printedName: 'Rui Tanaka',
    role: 'Quality engineer',
    meaning: 'prepared',
    now: now(11),
    effectiveDate: '2026-12-14',
    reviewDate: '2027-06-14',
    reactionPlan: 'Hold the oven cart and call the shift lead.',
  });
  if (!prepared.ok) throw new Error(JSON.stringify(prepared.findings));
  study = prepared.value.study;
  studyPath = writeStudy(folder, 'change.ledger', study);
  pdfPath = join(folder, 'change.pdf');
  xlsxPath = join(folder, 'change.xlsx');
  const made = await runCli(
    [
      'packet',
      studyPath,
      '--pdf',
      pdfPath,
      '--xlsx',
      xlsxPath,
      '--p12',
      p12.path,
      '--passphrase-env',
      'LL_PASS',
    ],
    { env: { LL_PASS: p12.passphrase } },
  );
  if (made.status !== 0) throw new Error(made.stderr);
  pdfText = run('pdftotext', ['-layout', pdfPath, '-']).stdout;
}, 180_000);

afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** The comparison computed independently of the packet, from each study's included counts. */
function expectedComparison() {
  const draft = study.revisions.at(-1)!;
  const proposed = revisionAnalysis(study, draft);
  const baseline = approvedBaseline(study, draft.supersedes);
  if (!proposed.ok || !baseline.ok) throw new Error('no analysis');
  const test = rateRatioTest(baseline.value.analysis.totals, proposed.value.totals);
  if (!test.ok) throw new Error('no test');
  return { test: test.value, proposed: proposed.value, approved: baseline.value.analysis };
}

describe('the change packet', () => {
  it('is made for the open change and verifies with limit-ledger verify, workbook included', async () => {
    const verified = await runCli(['verify', pdfPath, '--workbook', xlsxPath]);
    expect(verified.stdout).not.toMatch(/INVALID|differs/);
    expect(verified.status, verified.stdout + verified.stderr).toBe(0);
    expect(pdfText).toMatch(/revision 2/);
    // The revision it replaces is checked as well: approved, signed, and its limits as recorded.
    expect(verified.stdout).toMatch(/ok +the replaced revision 1 is approved/);
    expect(verified.stdout).toMatch(
      /ok +the replaced revision 1: sign-off "approved" by Dana Okafor .*: valid/,
    );
    expect(verified.stdout).toMatch(
      /ok +the replaced revision 1: its limits recompute to the center it records/,
    );
  });

  it('shows the reason, the revision it replaces and its sign-offs, early in the packet', () => {
    const change = pdfText.indexOf('Limit change');
    expect(change).toBeGreaterThan(0);
    expect(change).toBeLessThan(pdfText.indexOf('Approved limits'));
    expect(pdfText.slice(0, change)).toMatch(/Change packet: control limits/);
    expect(pdfText).toMatch(/The process changed/);
    expect(pdfText).toMatch(/burner controls replaced on oven 2/);
    expect(pdfText).toMatch(/revision 1 \(approved\), effective 2026-12-07/);
    // Appending periods after the approval leaves the approved revision's signatures valid.
    const flat = pdfText.replace(/\s+/g, ' ');
    expect(flat).toMatch(
      /approved by Dana Okafor \(Quality manager\), 2026-11-21T14:05:00\.000\+01:00: valid/,
    );
    expect(flat).toMatch(
      /prepared by Rui Tanaka \(Quality engineer\), 2026-11-21T08:30:00\.000\+01:00: valid/,
    );
    expect(pdfText).toMatch(/Przyborowski & Wilenski \(1940\)/);
    expect(pdfText).toMatch(/Clopper–Pearson \(1934\)/);
  });

  it('prints the rate ratio, interval and p-value of the exact test on the two studies’ counts', () => {
    const { test } = expectedComparison();
    // The same p-value summed from its definition with @stdlib (every outcome no more probable).
    const n = test.conditional.total;
    const p0 = test.conditional.nullProportion;
    const observed = binomialPmf(test.new.count, n, p0);
    let sum = 0;
    for (let i = 0; i <= n; i++) {
      const d = binomialPmf(i, n, p0);
      if (d <= observed * (1 + 1e-7)) sum += d;
    }
    expect(test.pValue / sum).toBeCloseTo(1, 9);
    expect(test.ratio).not.toBeNull();
    expect(test.ratio!).toBeLessThan(1); // the invented new shifts have fewer blemishes
    const flat = pdfText.replace(/\s+/g, ' ');
    expect(flat).toContain(`Rate ratio ${ratioShown(test.ratio)} (new rate / approved rate)`);
    expect(flat).toContain(`95 % interval ${ratioShown(test.ciLow)} to ${ratioShown(test.ciHigh)}`);
    expect(flat).toContain(`p-value, two-sided ${shownProbability(test.pValue)}`);
    expect(flat).toContain(`N = x_approved + x_new = ${test.base.count} + ${test.new.count} = ${n}`);
  });

  it('shows the limits at typical k, the run-length table, the step check and the before/after chart', () => {
    const flat = pdfText.replace(/\s+/g, ' ');
    expect(flat).toMatch(/Old and new limits at typical k/);
    expect(flat).toMatch(/in control \d/);
    for (const rise of ['+25 %', '+50 %', '+100 %']) expect(flat).toContain(`rate ${rise}`);
    expect(flat).toMatch(/Average run length of approved and proposed limits/);
    expect(flat).toMatch(/The history most likely splits between S\d+ and N\d+|splits between/);
    expect(flat).toMatch(/9,999 replications, generator .+, seed 20240601/);
    expect(flat).toMatch(/Before and after: revision 1 approved, revision 2 proposed/);
  });

  it('renders the change pages to PNG (the pages are looked at by eye; LL_KEEP_PAGES=DIR keeps them and the workbook)', () => {
    run('pdftoppm', ['-png', '-r', '70', '-f', '2', '-l', '3', pdfPath, join(folder, 'change-page')]);
    const pages = readdirSync(folder)
      .filter((name) => name.startsWith('change-page') && name.endsWith('.png'))
      .sort();
    expect(pages).toHaveLength(2);
    for (const page of pages) {
      const png = readFileSync(join(folder, page));
      expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
      if (process.env.LL_KEEP_PAGES) writeFileSync(join(process.env.LL_KEEP_PAGES, page), png);
    }
    if (process.env.LL_KEEP_PAGES)
      writeFileSync(join(process.env.LL_KEEP_PAGES, 'change.xlsx'), readFileSync(xlsxPath));
  });
});

describe('limit-ledger packet --help', () => {
  it('says that a revision superseding approved limits makes a change packet', async () => {
    const help = await runCli(['packet', '--help']);
    expect(help.status).toBe(0);
    expect(help.stdout.replace(/\s+/g, ' ')).toMatch(/supersedes approved limits .* change packet/);
  });
});

describe('the Change sheet, recomputed by LibreOffice', () => {
  let sheet: ExcelJS.Worksheet;
  beforeAll(async () => {
    const content = packetContent({
      study,
      revision: study.revisions.at(-1)!,
      studyBytes: Buffer.from(formatStudy(study)),
      studyFileName: 'change.ledger',
      generatedAt: now(12),
    });
    if (!content.ok) throw new Error(JSON.stringify(content.findings));
    const bare = join(folder, 'bare.xlsx');
    writeFileSync(bare, await buildWorkbook(content.value, { withoutCachedValues: true }));
    const [recalculated] = recalculateWithLibreOffice([bare]);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(readFileSync(recalculated!) as unknown as ExcelJS.Buffer);
    sheet = book.getWorksheet('Change')!;
  }, 120_000);

  const value = (address: string) => {
    const v = sheet.getCell(address).value;
    return v !== null && typeof v === 'object' && 'result' in v ? v.result : v;
  };

  it('gives the same sums, ratio and interval from the counts in the workbook', () => {
    const { test } = expectedComparison();
    expect(value(changeCells.approvedCount)).toBe(test.base.count);
    expect(value(changeCells.approvedUnits)).toBe(test.base.units);
    expect(value(changeCells.proposedCount)).toBe(test.new.count);
    expect(value(changeCells.proposedUnits)).toBe(test.new.units);
    expect(value(changeCells.ratio) as number).toBeCloseTo(test.ratio!, 12);
    // LibreOffice's BETA.INV is its own inverse: agreement to 1e-8 relative.
    expect((value(changeCells.ciLow) as number) / test.ciLow).toBeCloseTo(1, 8);
    expect((value(changeCells.ciHigh) as number) / test.ciHigh!).toBeCloseTo(1, 8);
    expect((value(changeCells.pValue) as number) / test.pValue).toBeCloseTo(1, 12);
  });

  it('gives the same old and new limits at typical k, and keeps a formula-like reason as text', () => {
    const { proposed, approved } = expectedComparison();
    const content = packetContent({
      study,
      revision: study.revisions.at(-1)!,
      studyBytes: Buffer.from(''),
      studyFileName: 'x',
      generatedAt: now(12),
    });
    if (!content.ok) throw new Error('no content');
    const limits = content.value.change!.evidence.limits;
    expect(limits.length).toBeGreaterThan(0);
    limits.forEach((l, i) => {
      const r = changeCells.limitsTop + i;
      expect(value(`A${r}`)).toBe(l.units);
      expect(value(`B${r}`) as number).toBeCloseTo(l.approved.center, 12);
      expect(value(`D${r}`) as number).toBeCloseTo(l.approved.ucl, 12);
      expect(value(`E${r}`) as number).toBeCloseTo(l.proposed.center, 12);
      expect(value(`G${r}`) as number).toBeCloseTo(l.proposed.ucl, 12);
      const lcl = value(`F${r}`);
      if (l.proposed.lcl === null) expect(lcl).toBe('none');
      else expect(lcl as number).toBeCloseTo(l.proposed.lcl, 12);
      expect(value(`H${r}`)).toBe(l.wider ? 'wider' : 'no');
    });
    // The centers are the two studies' own rates (u charts): Σx/Σk of each.
    expect(value(changeCells.approvedRate) as number).toBeCloseTo(approved.rate, 12);
    expect(proposed.rate).toBeCloseTo(proposed.totals.count / proposed.totals.units, 12);
    const reason = sheet.getCell('B4');
    expect(reason.type).toBe(ExcelJS.ValueType.String);
    expect(String(reason.value)).toMatch(/^=HYPERLINK/);
  });
});
