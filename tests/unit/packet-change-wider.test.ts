import { spawnSync } from 'node:child_process';
import { approvedDemoStudy } from '../integration/fixtures/approved-demo.js';
import { describe, expect, it } from 'vitest';
import { firstNewPeriod, proposeChange } from '../../shared-core/changes/propose-change.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';
import { addPeriods } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { packetContent, packetRevision } from '../../src-main/services/packet/packet-from-study.js';
import { buildPacketPdf } from '../../src-main/services/packet/packet-pdf.js';
import type { PacketFacts } from '../../src-main/services/packet/packet-facts.js';

/**
 * A change to a higher rate: the proposed limits are wider than the approved ones, and the change
 * packet says so in its first lines (common practice: wider limits let a worse process pass).
 * Invented data: the demo study and 12 invented shifts of 40 panels with more blemishes.
 */
const now = (minute: number) => `2026-11-22T09:${String(minute).padStart(2, '0')}:00.000+01:00`;

async function widerChange(): Promise<Study> {
  const study = await approvedDemoStudy('st-wider', now);
  const counts = [9, 11, 8, 12, 10, 9, 13, 10, 11, 9, 12, 10];
  const observations: Observation[] = counts.map((count, i) => ({
    label: `W${String(i + 1).padStart(2, '0')}`,
    row: i + 2,
    count,
    units: 40,
  }));
  const added = addPeriods(
    study,
    { who: 'Rui Tanaka', file: 'w.csv', sourceSha256: 'd'.repeat(64), observations },
    now(3),
  );
  if (!added.ok) throw new Error(added.findings[0].message);
  const proposed = proposeChange(
    added.value,
    {
      who: 'Rui Tanaka',
      category: 'customer-request',
      reason: 'new frit supplier (invented)',
      firstIndex: firstNewPeriod(added.value),
    },
    now(4),
  );
  if (!proposed.ok) throw new Error(proposed.findings[0].message);
  return proposed.value;
}

describe('a change packet for wider limits', () => {
  it('is made for the open change, flags the wider limits and prints the flag', async () => {
    const study = await widerChange();
    const revision = packetRevision(study)!;
    expect(revision.supersedes).toBe('rev-1');
    const content = packetContent({
      study,
      revision,
      studyBytes: new Uint8Array(),
      studyFileName: 'wider.ledger',
      generatedAt: now(5),
    });
    if (!content.ok) throw new Error(content.findings[0].message);
    const change = content.value.change!;
    expect(change.reasonWords).toMatch(/customer asked/);
    expect(change.evidence.wider).toBe(true);
    expect(change.evidence.limits.every((l) => l.proposed.ucl > l.approved.ucl)).toBe(true);
    expect(change.evidence.comparison.ratio!).toBeGreaterThan(1);
    const facts = { workbookSha256: null, studySha256: null } as unknown as PacketFacts;
    const pdf = await buildPacketPdf(content.value, { paper: 'letter', facts });
    const text = spawnSync('pdftotext', ['-', '-'], { input: pdf })
      .stdout.toString('utf8')
      .replace(/\s+/g, ' ');
    expect(text).toContain('The proposed limits are WIDER than the approved ones');
    expect(text).toMatch(/New UCL Wider\? 40 .* 0\.499425 WIDER /);
    expect(text).toContain('this test and interval assume Poisson counts, so they are optimistic');
    expect(text).toContain('The customer asked for the limits to be revised');
  }, 60_000);
});
