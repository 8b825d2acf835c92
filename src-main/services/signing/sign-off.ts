import { createPublicKey, sign as rsaSign, verify as rsaVerify, X509Certificate } from 'node:crypto';
import { appendEvent, chainHead, sealStudy } from '../../../shared-core/study/audit-chain.js';
import type { Revision, SignOff, SignOffMeaning } from '../../../shared-core/study/revision-schema.js';
import { signOffBytes } from '../../../shared-core/study/signed-content.js';
import {
  missingMeanings,
  signOffRefusal,
  type SignOffRule,
} from '../../../shared-core/study/sign-off-rules.js';
import { deriveState } from '../../../shared-core/study/study-state.js';
import type { Study } from '../../../shared-core/study/study-schema.js';
import { SiteSettingsSchema, defaultSiteSettings } from '../../../shared-core/settings/site-settings.js';
import { fail, ok, type Result } from '../../../shared-core/result.js';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { changeScopeProblem } from '../../../shared-core/changes/propose-change.js';
import { limitsTable } from '../../../shared-core/study/revision-limits.js';
import { currentAnalysis, revisionAnalysis, type Scope } from '../../../shared-core/study/revision-scope.js';
import type { SignOffLine } from '../packet/packet-content.js';
import { certificateFacts } from './certificate-facts.js';
import type { SigningIdentity } from './signing-identity.js';

export interface RevisionFields {
  effectiveDate?: string;
  reviewDate?: string;
  reactionPlan?: string;
}

export interface SignOffRequest extends RevisionFields {
  printedName: string;
  role: string;
  meaning: SignOffMeaning;
  /** The local clock's reading with its offset (local-time.ts). */
  now: string;
}

export interface SignedStudy {
  study: Study;
  revision: Revision;
  /** What happened, in words, for the CLI to print. */
  notes: string[];
}

/** The sign-off rule the study was made under (its recorded site settings), else the defaults. */
export function signOffRule(study: Study): SignOffRule {
  const parsed = SiteSettingsSchema.safeParse(study.siteSettings);
  return (parsed.success ? parsed.data : defaultSiteSettings).signOff;
}

export { revisionAnalysis };

/** Whether a revision still describes the study as its decisions now stand. */
function describesNow(revision: Revision, result: AnalysisResult & { scope: Scope }, study: Study): boolean {
  const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);
  return (
    (revision.segmentStart ?? 0) === result.scope.start &&
    same(revision.method, deriveState(study).method) &&
    revision.center === result.center &&
    same(revision.limits, limitsTable(result)) &&
    same(revision.excluded, excludedLabels(result))
  );
}

const excludedLabels = (result: AnalysisResult) =>
  result.periods.filter((p) => p.status === 'excluded').map((p) => p.label);
const includedLabels = (result: AnalysisResult) =>
  result.periods.filter((p) => p.status !== 'excluded').map((p) => p.label);

/**
 * Adds a sign-off to the study's open revision, drafting one from the current analysis when
 * there is none. The signature (RSA-SHA256) covers the revision's canonical signed content, the
 * sign-off's own fields and the earlier sign-offs (signed-content.ts). Approving freezes the
 * revision; an approved revision is never edited: a change makes a new revision.
 */
export function addSignOff(
  study: Study,
  identity: SigningIdentity,
  request: SignOffRequest,
): Result<SignedStudy> {
  const who = request.printedName.trim();
  if (!who) return fail({ message: 'a sign-off needs the printed name of the signer (--signer)' });
  if (!request.role.trim()) return fail({ message: 'a sign-off needs the signer’s role (--role)' });
  const analysis = currentAnalysis(study);
  if (!analysis.ok) return analysis;
  const notes: string[] = [];
  let current = study;
  let revision = [...current.revisions].reverse().find((r) => r.status === 'draft');
  const fields: RevisionFields = {
    ...(request.effectiveDate ? { effectiveDate: request.effectiveDate } : {}),
    ...(request.reviewDate ? { reviewDate: request.reviewDate } : {}),
    ...(request.reactionPlan ? { reactionPlan: request.reactionPlan } : {}),
  };

  const moved = revision && changeScopeProblem(current, revision, analysis.value.scope.start);
  if (moved) return fail({ message: moved });
  let carried: ChangeFields = {};
  if (revision && !describesNow(revision, analysis.value, current)) {
    if (revision.signOffs.length > 0) {
      carried = changeFields(revision);
      current = replaceRevision(current, { ...revision, status: 'void' });
      current = appendEvent(
        current,
        {
          type: 'revision-voided',
          who,
          why: 'the study changed after it was signed',
          payload: { revisionId: revision.id },
        },
        request.now,
      );
      notes.push(
        `revision ${revision.number} no longer describes the study (decisions were made after it was signed); it is void, and a new revision is drafted`,
      );
      revision = undefined;
    } else {
      revision = redraft(revision, analysis.value, current, fields);
      current = appendEvent(
        current,
        {
          type: 'revision-changed',
          who,
          why: 'brought up to date with the study',
          payload: { revisionId: revision.id },
        },
        request.now,
      );
      revision = { ...revision, chainHead: chainHead(current) };
      current = replaceRevision(current, revision);
    }
  }
  if (revision && Object.keys(fields).length > 0) {
    const changed = (Object.keys(fields) as (keyof RevisionFields)[]).some(
      (key) => revision![key] !== fields[key],
    );
    if (changed && revision.signOffs.length > 0) {
      return fail({
        message: `revision ${revision.number} is already signed by ${revision.signOffs.map((s) => s.printedName).join(', ')}; its effective date, review date and reaction plan can no longer change (sign without them, or draft a new revision)`,
      });
    }
    if (changed) {
      current = appendEvent(
        current,
        { type: 'revision-changed', who, why: 'revision fields set', payload: { revisionId: revision.id } },
        request.now,
      );
      revision = { ...revision, ...fields, chainHead: chainHead(current) };
      current = replaceRevision(current, revision);
    }
  }
  if (!revision) {
    const approved = current.revisions.find(
      (r) => r.status === 'approved' && describesNow(r, analysis.value, current),
    );
    if (approved) {
      return fail({
        message: `revision ${approved.number} is approved and describes the study as it stands; an approved revision cannot be signed again or edited`,
      });
    }
    const standing = current.revisions.filter((r) => r.status === 'approved');
    if (standing.length > 0 && !carried.supersedes) {
      const latest = standing.reduce((a, b) => (b.number > a.number ? b : a));
      return fail({
        message: `revision ${latest.number} is approved; changing its limits needs a proposed change with its reason first (the Changes screen, or proposeChange), then this sign-off`,
      });
    }
    const number = current.revisions.reduce((max, r) => Math.max(max, r.number), 0) + 1;
    const id = `rev-${number}`;
    current = appendEvent(
      current,
      { type: 'revision-drafted', who, payload: { revisionId: id } },
      request.now,
    );
    revision = redraft(
      {
        id,
        number,
        status: 'draft',
        method: deriveState(current).method,
        center: 0,
        limits: [],
        included: [],
        excluded: [],
        chainHead: chainHead(current),
        signOffs: [],
        ...carried,
      },
      analysis.value,
      current,
      fields,
    );
    revision = { ...revision, chainHead: chainHead(current) };
    current = sealStudy({ ...current, revisions: [...current.revisions, revision] });
    notes.push(`revision ${number} drafted from the current analysis`);
  }

  const facts = certificateFacts(identity.certificate);
  const refusal = signOffRefusal(signOffRule(current), revision.signOffs, {
    meaning: request.meaning,
    fingerprint: facts.fingerprint,
    printedName: who,
  });
  if (refusal) return fail({ message: refusal });
  const unsigned: Omit<SignOff, 'signature'> = {
    printedName: who,
    role: request.role.trim(),
    meaning: request.meaning,
    time: request.now,
    certificatePem: pem(identity.certificate),
    fingerprint: facts.fingerprint,
    selfIssued: facts.selfIssued,
    algorithm: 'RSA-SHA256',
  };
  const bytes = signOffBytes(current, revision, unsigned, revision.signOffs);
  const signature = rsaSign('sha256', bytes, identity.privateKey).toString('base64');
  const signOff: SignOff = { ...unsigned, signature };
  const rule = signOffRule(current);
  const signOffs = [...revision.signOffs, signOff];
  const complete = missingMeanings(rule, signOffs).length === 0 && request.meaning === 'approved';
  revision = { ...revision, signOffs, ...(complete ? { status: 'approved' as const } : {}) };
  current = replaceRevision(current, revision);
  current = appendEvent(
    current,
    {
      type: 'signed',
      who,
      payload: { revisionId: revision.id, meaning: request.meaning, fingerprint: facts.fingerprint },
    },
    request.now,
  );
  if (complete) {
    current = appendEvent(
      current,
      { type: 'revision-approved', who, payload: { revisionId: revision.id } },
      request.now,
    );
    notes.push(`revision ${revision.number} is approved and frozen`);
  } else {
    const missing = missingMeanings(rule, signOffs);
    if (missing.length > 0) notes.push(`still needed: ${missing.join(', ')}`);
  }
  return ok({ study: current, revision, notes });
}

type ChangeFields = Pick<Revision, 'reasonCategory' | 'reasonForChange' | 'supersedes'>;

/** What makes a revision a limit change: kept when a voided draft is drafted again. */
function changeFields(revision: Revision): ChangeFields {
  const { reasonCategory, reasonForChange, supersedes } = revision;
  return {
    ...(reasonCategory ? { reasonCategory } : {}),
    ...(reasonForChange ? { reasonForChange } : {}),
    ...(supersedes ? { supersedes } : {}),
  };
}

function redraft(
  revision: Revision,
  result: AnalysisResult & { scope: Scope },
  study: Study,
  fields: RevisionFields,
): Revision {
  return {
    ...revision,
    ...fields,
    ...(result.scope.start > 0 || revision.segmentStart !== undefined
      ? { segmentStart: result.scope.start }
      : {}),
    method: deriveState(study).method,
    center: result.center,
    limits: limitsTable(result),
    included: includedLabels(result),
    excluded: excludedLabels(result),
  };
}

function replaceRevision(study: Study, revision: Revision): Study {
  return sealStudy({
    ...study,
    revisions: study.revisions.map((r) => (r.id === revision.id ? revision : r)),
  });
}

const pem = (der: Buffer) =>
  `-----BEGIN CERTIFICATE-----\n${(der.toString('base64').match(/.{1,64}/g) ?? []).join('\n')}\n-----END CERTIFICATE-----\n`;

/**
 * Each sign-off of a revision checked again: its certificate's fingerprint, and its signature over
 * the signed content as it is now. A signature that no longer verifies means the signed content
 * changed after signing: the sign-off is void, and is shown as void.
 */
export function signOffStates(study: Study, revision: Revision): SignOffLine[] {
  return revision.signOffs.map((signOff, i) => {
    const line: SignOffLine = {
      printedName: signOff.printedName,
      role: signOff.role,
      meaning: signOff.meaning,
      time: signOff.time,
      fingerprint: signOff.fingerprint,
      selfIssued: signOff.selfIssued,
      state: 'valid',
    };
    let certificate: X509Certificate;
    try {
      certificate = new X509Certificate(signOff.certificatePem);
    } catch {
      return { ...line, state: 'invalid', note: 'its certificate cannot be read' };
    }
    const facts = certificateFacts(certificate.raw);
    if (facts.fingerprint !== signOff.fingerprint)
      return { ...line, state: 'invalid', note: 'its fingerprint does not match its certificate' };
    line.selfIssued = facts.selfIssued;
    const bytes = signOffBytes(study, revision, signOff, revision.signOffs.slice(0, i));
    let holds: boolean;
    try {
      holds = rsaVerify(
        'sha256',
        bytes,
        createPublicKey(certificate.publicKey.export({ type: 'spki', format: 'pem' })),
        Buffer.from(signOff.signature, 'base64'),
      );
    } catch {
      holds = false;
    }
    return holds ? line : { ...line, state: 'void', note: 'the signed content changed after signing' };
  });
}
