import { createHash, X509Certificate } from 'node:crypto';
import type { Revision } from '../../../shared-core/study/revision-schema.js';
import type { Study } from '../../../shared-core/study/study-schema.js';
import { verifyStudy } from '../../../shared-core/study/verify-study.js';
import { parseStudy } from '../../../shared-core/study/study-text.js';
import { describeFinding } from '../../../shared-core/result.js';
import { verifyDetachedCms } from '../signing/cms-verify.js';
import { shortFingerprint } from '../signing/certificate-facts.js';
import { revisionAnalysis, signOffStates } from '../signing/sign-off.js';
import { limitsTable } from './limits-table.js';
import { factsFileName, type PacketFacts } from './packet-facts.js';
import { changesAfter, embeddedFiles } from './pdf-structure.js';
import { findSignatures, signedBytes } from './pdf-signature.js';
import { readWorkbookStatement } from './packet-workbook.js';

export interface VerdictLine {
  ok: boolean;
  text: string;
}

export interface Verdict {
  ok: boolean;
  lines: VerdictLine[];
}

export interface VerifyRequest {
  pdf: Buffer;
  workbook?: Buffer;
  /** DER of the certificates the reader trusts (signers, or their issuers). */
  trusted?: Buffer[];
}

/** Stated and recomputed limits agree when they differ by no more than this (both are doubles). */
const tolerance = 1e-9;

/**
 * Checks a packet on its own: every PDF signature over its byte range, that nothing but further
 * signatures follows a signature, the embedded study (schema, audit chain, sign-offs), a fresh
 * recomputation of the limits against what the PDF states and, when given, against the workbook
 * and its hash. `ok` only when every line holds.
 */
export async function verifyPacket(request: VerifyRequest): Promise<Verdict> {
  const lines: VerdictLine[] = [];
  const say = (ok: boolean, text: string) => lines.push({ ok, text });
  const pdf = request.pdf;
  const trusted = (request.trusted ?? []).map((der) => new X509Certificate(der));

  const signatures = findSignatures(pdf);
  if (signatures.length === 0) say(false, 'the PDF is not signed');
  for (const [i, signature] of signatures.entries()) {
    const label = `signature ${i + 1}${signature.name ? ` (${signature.name})` : ''}`;
    const [start1, length1, start2, length2] = signature.byteRange;
    const holeIsContents =
      start1 === 0 &&
      pdf[length1] === 0x3c &&
      pdf[start2 - 1] === 0x3e &&
      start2 + length2 <= pdf.length &&
      length1 < start2;
    if (!holeIsContents) {
      say(false, `${label}: its byte range does not leave out exactly its own signature value`);
      continue;
    }
    const check = verifyDetachedCms(signature.cms, signedBytes(pdf, signature));
    if (!check.valid) {
      say(false, `${label}: INVALID — ${check.problems.join('; ')}`);
      continue;
    }
    const facts = check.signer!;
    const trust = trustOf(check.signerCertificate!, check.certificates, trusted);
    const trustWords =
      trust === 'trusted'
        ? 'trusted certificate'
        : facts.selfIssued
          ? 'self-issued certificate, not in the trusted list'
          : 'certificate not trusted (issuer unknown)';
    say(
      trust === 'trusted' || trusted.length === 0,
      `${label}: valid over bytes 0–${length1 - 1} and ${start2}–${start2 + length2 - 1}, signed by ${facts.commonName}${check.signingTime ? ` at ${check.signingTime}` : ''}; ${trustWords}; certificate SHA-256 ${shortFingerprint(facts.fingerprint)}`,
    );
  }
  if (signatures.length > 0) {
    const last = Math.max(...signatures.map((s) => s.coveredEnd));
    const trailing = pdf.subarray(last).toString('latin1');
    if (trailing.trim().length > 0)
      say(false, `${pdf.length - last} bytes after the last signature are covered by no signature`);
    const first = Math.min(...signatures.map((s) => s.coveredEnd));
    const changes = changesAfter(pdf, first);
    say(
      changes.length === 0,
      changes.length === 0
        ? 'after the first signature the file holds only further signatures'
        : `changed after signing: ${changes.join('; ')}`,
    );
  }

  const files = embeddedFiles(pdf);
  for (const file of files)
    if (!file.bytes) say(false, `the embedded file ${file.name} is damaged and cannot be read`);
  const factsFile = files.find((f) => f.name === factsFileName);
  const studyFile = files.find((f) => f.name !== factsFileName);
  let facts: PacketFacts | null;
  try {
    facts = factsFile?.bytes ? (JSON.parse(factsFile.bytes.toString('utf8')) as PacketFacts) : null;
  } catch {
    facts = null;
  }
  if (!facts || facts.format !== 'limit-ledger-packet-facts') {
    say(false, 'the PDF carries no readable statement of its limits (packet-facts.json)');
    return { ok: false, lines };
  }
  if (!studyFile) {
    say(false, 'the PDF carries no embedded study');
  } else if (studyFile.bytes) {
    checkStudy(studyFile.bytes, studyFile.name, facts, say);
  }

  if (request.workbook) {
    const hash = createHash('sha256').update(request.workbook).digest('hex');
    say(
      hash === facts.workbookSha256,
      hash === facts.workbookSha256
        ? `the workbook is the one the PDF names (SHA-256 ${hash.slice(0, 16)}…)`
        : `the workbook’s SHA-256 ${hash.slice(0, 16)}… is not the ${facts.workbookSha256 ? `${facts.workbookSha256.slice(0, 16)}…` : 'none'} that the PDF states`,
    );
    try {
      const sheet = await readWorkbookStatement(request.workbook);
      const mismatches: string[] = [];
      if (sheet.center === null || Math.abs(sheet.center - facts.center) > tolerance)
        mismatches.push(`center ${sheet.center} ≠ ${facts.center}`);
      if (sheet.periods.length !== facts.periods.length)
        mismatches.push(`${sheet.periods.length} rows ≠ ${facts.periods.length} periods`);
      facts.periods.forEach((p, i) => {
        const row = sheet.periods[i];
        if (!row || !near(row.ucl, p.ucl) || !near(row.lcl, p.lcl)) mismatches.push(`limits of ${p.label}`);
      });
      if (sheet.checksHold === false) mismatches.push('a probability-limit check cell is FALSE');
      say(
        mismatches.length === 0,
        mismatches.length === 0
          ? 'the workbook states the same center and limits'
          : `the workbook differs: ${mismatches.slice(0, 5).join('; ')}`,
      );
    } catch (error) {
      say(false, `the workbook cannot be read (${error instanceof Error ? error.message : String(error)})`);
    }
  }
  return { ok: lines.every((l) => l.ok), lines };
}

function checkStudy(
  bytes: Buffer,
  name: string,
  facts: PacketFacts,
  say: (ok: boolean, text: string) => void,
): void {
  const hash = createHash('sha256').update(bytes).digest('hex');
  if (facts.studySha256 !== hash)
    say(false, `the embedded study ${name} is not the one the PDF states (SHA-256 differs)`);
  const parsed = parseStudy(bytes.toString('utf8').replace(/^\uFEFF/, ''), name);
  if (!parsed.ok) {
    say(false, `the embedded study does not open: ${parsed.findings.map(describeFinding).join('; ')}`);
    return;
  }
  const study = parsed.value.study;
  const problems = verifyStudy(study).filter((p) => p.level === 'error');
  say(
    problems.length === 0,
    problems.length === 0
      ? `the embedded study ${name} opens and its audit chain holds (${study.events.length} events)`
      : `the study’s record is broken: ${problems.map((p) => p.message).join('; ')}`,
  );
  const revision: Revision | undefined = study.revisions.find((r) => r.number === facts.revision);
  if (!revision) {
    say(false, `the study has no revision ${facts.revision}`);
    return;
  }
  for (const line of signOffStates(study, revision)) {
    say(
      line.state === 'valid',
      `sign-off "${line.meaning}" by ${line.printedName} (${line.role}, ${line.time}${line.selfIssued ? ', self-issued' : ''}): ${line.state === 'valid' ? 'valid' : `${line.state.toUpperCase()} — ${line.note ?? ''}`}`,
    );
  }
  if (revision.supersedes !== undefined) checkReplaced(study, revision, revision.supersedes, say);
  const analysis = revisionAnalysis(study, revision);
  if (!analysis.ok) {
    say(false, `the limits cannot be recomputed: ${analysis.findings.map(describeFinding).join('; ')}`);
    return;
  }
  const result = analysis.value;
  const mismatches: string[] = [];
  if (Math.abs(result.center - facts.center) > tolerance)
    mismatches.push(`center ${facts.center} stated, ${result.center} recomputed`);
  if (Math.abs(result.center - revision.center) > tolerance)
    mismatches.push(`the revision records center ${revision.center}`);
  const table = limitsTable(result);
  if (
    table.length !== facts.table.length ||
    table.some(
      (row, i) =>
        !near(row.ucl, facts.table[i]!.ucl) ||
        !near(row.lcl, facts.table[i]!.lcl) ||
        row.units !== facts.table[i]!.units,
    )
  ) {
    mismatches.push('the limits table');
  }
  if (
    result.periods.length !== facts.periods.length ||
    result.periods.some(
      (p, i) =>
        !near(p.ucl, facts.periods[i]!.ucl) ||
        !near(p.lcl, facts.periods[i]!.lcl) ||
        p.status !== facts.periods[i]!.status,
    )
  ) {
    mismatches.push('the period limits or statuses');
  }
  say(
    mismatches.length === 0,
    mismatches.length === 0
      ? `recomputed with the core: center ${result.center}, ${table.length} limit step${table.length === 1 ? '' : 's'}, as the PDF states`
      : `the recomputed limits differ from the PDF: ${mismatches.join('; ')}`,
  );
}

const near = (a: number | null | undefined, b: number | null) =>
  a === null || a === undefined ? b === null && a === null : b !== null && Math.abs(a - b) <= tolerance;

function trustOf(signer: Buffer, bundled: Buffer[], trusted: X509Certificate[]): 'trusted' | 'untrusted' {
  const certificate = new X509Certificate(signer);
  const isTrusted = (c: X509Certificate) => trusted.some((t) => t.fingerprint256 === c.fingerprint256);
  const issuedByTrusted = (c: X509Certificate) =>
    trusted.some((t) => c.checkIssued(t) && c.verify(t.publicKey));
  if (isTrusted(certificate) || issuedByTrusted(certificate)) return 'trusted';
  // One intermediate that came with the signature and is itself issued by a trusted certificate.
  for (const der of bundled) {
    const intermediate = new X509Certificate(der);
    if (
      certificate.checkIssued(intermediate) &&
      certificate.verify(intermediate.publicKey) &&
      (isTrusted(intermediate) || issuedByTrusted(intermediate))
    ) {
      return 'trusted';
    }
  }
  return 'untrusted';
}

/**
 * A change packet stands on the revision it replaces: that revision must be in the study, approved,
 * its sign-offs valid, and its limits must still recompute to the center it records.
 */
function checkReplaced(
  study: Study,
  revision: Revision,
  replacedId: string,
  say: (ok: boolean, text: string) => void,
): void {
  const replaced = study.revisions.find((r) => r.id === replacedId);
  if (!replaced) {
    say(false, `revision ${revision.number} replaces a revision the study does not hold (${replacedId})`);
    return;
  }
  const which = `the replaced revision ${replaced.number}`;
  say(replaced.status === 'approved', `${which} is ${replaced.status}`);
  for (const line of signOffStates(study, replaced)) {
    say(
      line.state === 'valid',
      `${which}: sign-off "${line.meaning}" by ${line.printedName} (${line.role}, ${line.time}): ${line.state === 'valid' ? 'valid' : `${line.state.toUpperCase()} — ${line.note ?? ''}`}`,
    );
  }
  const analysis = revisionAnalysis(study, replaced);
  say(
    analysis.ok && Math.abs(analysis.value.center - replaced.center) <= tolerance,
    analysis.ok
      ? `${which}: its limits recompute to the center it records (${replaced.center})${Math.abs(analysis.value.center - replaced.center) <= tolerance ? '' : `, NOT: ${analysis.value.center}`}`
      : `${which}: its limits cannot be recomputed: ${analysis.findings.map(describeFinding).join('; ')}`,
  );
}
