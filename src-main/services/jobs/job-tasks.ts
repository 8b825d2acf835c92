/**
 * The long work the hosts run in workers: import, packet export and signing. Each task calls its
 * service with the job's AbortSignal and progress reporter; the export writes only to the job's
 * temporary output, which the runner renames into place once the job has succeeded.
 */
import { writeFile } from 'node:fs/promises';
import { fail, ok, type Result } from '../../../shared-core/result.js';
import { localTime } from '../../../shared-core/study/local-time.js';
import type { Study } from '../../../shared-core/study/study-schema.js';
import { formatStudy, parseStudy } from '../../../shared-core/study/study-text.js';
import type { SignOffMeaning } from '../../../shared-core/settings/site-settings.js';
import { verifyStudy } from '../../../shared-core/study/verify-study.js';
import { hasErrors } from '../../../shared-core/study/study-problem.js';
import type { ImportRequest } from '../import/import-request.js';
import { importBytes } from '../import/import-file.js';
import { packetFiles } from '../packet/make-packet.js';
import { packetContent, packetRevision } from '../packet/packet-from-study.js';
import { writeOwnerOnly } from '../signing/key-file.js';
import {
  createPersonalIdentity,
  personalKeyFileText,
  readPersonalKeyFile,
} from '../signing/personal-certificate.js';
import { readPkcs12 } from '../signing/pkcs12-identity.js';
import { addSignOff } from '../signing/sign-off.js';
import type { SigningIdentity } from '../signing/signing-identity.js';
import type { JobTask } from './job-task.js';

const now = (): string => localTime(Date.now(), -new Date().getTimezoneOffset());

function stopIfCancelled(signal: AbortSignal): void {
  if (signal.aborted) throw Object.assign(new Error('cancelled'), { name: 'AbortError' });
}

/** A job that cannot do its work fails with the findings that say why (shown as they are). */
class JobFindings extends Error {
  constructor(readonly findings: { message: string }[]) {
    super(findings.map((finding) => finding.message).join('; '));
  }
}

function studyFrom(document: unknown, fileName: string): Study {
  const parsed = parseStudy(JSON.stringify(document), fileName);
  if (!parsed.ok) throw new JobFindings(parsed.findings);
  return parsed.value.study;
}

/** Import phases as rough fractions of the whole, so a bar moves even where a phase has no count. */
const importPhases = { reading: 0.1, checking: 0.2, decoding: 0.4, validating: 0.8 } as const;

const importData: JobTask = async (input, { signal, progress }) => {
  const { fileName, bytes, request } = input as {
    fileName: string;
    bytes: Uint8Array;
    request: ImportRequest;
  };
  const outcome = await importBytes(fileName, bytes, request, signal, {
    onProgress: ({ phase, fraction }) => {
      const start = importPhases[phase];
      const end = phase === 'validating' ? 1 : start + 0.2;
      progress(start + (fraction ?? 0) * (end - start), `${phase} ${fileName}`);
    },
  });
  stopIfCancelled(signal);
  return outcome;
};

const exportPacket: JobTask = async (input, { signal, progress, outputPath }) => {
  const { document, format, paper, signature } = input as {
    document: unknown;
    format: 'pdf' | 'workbook';
    paper: 'a4' | 'letter';
    signature?: { key: { fileName: string; bytes: Uint8Array }; passphrase: string };
  };
  // The key is opened first, so a wrong passphrase fails before the packet is drawn.
  let identity: SigningIdentity | undefined;
  if (signature && format === 'pdf') {
    progress(0.02, 'opening the key');
    const opened = identityFrom(signature.key, signature.passphrase);
    if (!opened.ok) throw new JobFindings(opened.findings);
    identity = opened.value;
  }
  const study = studyFrom(document, 'the study');
  if (hasErrors(verifyStudy(study))) {
    throw new JobFindings([{ message: 'the study’s record does not verify; no packet is made from it' }]);
  }
  const revision = packetRevision(study);
  if (!revision)
    throw new JobFindings([
      { message: 'the study has no revision of its limits yet: sign it as prepared first' },
    ]);
  const studyText = formatStudy(study);
  const content = packetContent({
    study,
    revision,
    studyBytes: new TextEncoder().encode(studyText),
    studyFileName: `${study.id}.ledger`,
    generatedAt: now(),
  });
  if (!content.ok) throw new JobFindings(content.findings);
  stopIfCancelled(signal);
  const files = await packetFiles(content.value, {
    paper,
    ...(identity ? { identity } : {}),
    onProgress: (fraction, what) => {
      stopIfCancelled(signal);
      progress(fraction * 0.95, what);
    },
  });
  stopIfCancelled(signal);
  await writeFile(outputPath!, format === 'pdf' ? files.pdf : files.workbook);
  progress(1, 'written');
  return identity ? { format, signedBy: identity.facts.fingerprint } : { format };
};

function identityFrom(
  key: { fileName: string; bytes: Uint8Array },
  passphrase: string,
): Result<SigningIdentity> {
  try {
    const bytes = Buffer.from(key.bytes);
    const pem = bytes.subarray(0, 64).toString('latin1').includes('-----BEGIN');
    return ok(
      pem
        ? readPersonalKeyFile(bytes.toString('utf8'), passphrase, key.fileName)
        : readPkcs12(bytes, passphrase, key.fileName),
    );
  } catch (error) {
    return fail({ file: key.fileName, message: error instanceof Error ? error.message : String(error) });
  }
}

const signStudy: JobTask = async (input, { signal, progress }) => {
  const request = input as {
    document: unknown;
    meaning: SignOffMeaning;
    printedName: string;
    role: string;
    key: { fileName: string; bytes: Uint8Array };
    passphrase: string;
  };
  progress(0.1, 'opening the key');
  const identity = identityFrom(request.key, request.passphrase);
  if (!identity.ok) throw new JobFindings(identity.findings);
  stopIfCancelled(signal);
  progress(0.5, 'signing');
  const study = studyFrom(request.document, 'the study');
  const signed = addSignOff(study, identity.value, {
    printedName: request.printedName,
    role: request.role,
    meaning: request.meaning,
    now: now(),
  });
  if (!signed.ok) throw new JobFindings(signed.findings);
  stopIfCancelled(signal);
  progress(1, 'signed');
  return {
    document: signed.value.study,
    fingerprint: identity.value.facts.fingerprint,
    notes: signed.value.notes,
  };
};

/** A personal signing certificate: the key file, encrypted with the passphrase, written owner-only. */
const createSigningKey: JobTask = async (input, { signal, progress, outputPath }) => {
  const { printedName, organization, passphrase } = input as {
    printedName: string;
    organization?: string;
    passphrase: string;
  };
  progress(0.1, 'making an RSA 3072 key');
  const identity = await createPersonalIdentity({
    name: printedName,
    ...(organization ? { organization } : {}),
  });
  stopIfCancelled(signal);
  progress(0.5, 'encrypting the key with the passphrase');
  const text = await personalKeyFileText(identity, passphrase);
  stopIfCancelled(signal);
  await writeOwnerOnly(outputPath!, text);
  progress(1, 'written');
  return { fingerprint: identity.facts.fingerprint, commonName: identity.facts.commonName };
};

export const tasks: Record<string, JobTask> = { importData, exportPacket, signStudy, createSigningKey };
