import { describeFinding } from '../../../shared-core/result.js';
import { localTime } from '../../../shared-core/study/local-time.js';
import { signOffMeaningSchema } from '../../../shared-core/study/revision-schema.js';
import { openStudyFile, saveStudyFile } from '../../services/study-file.js';
import { keyUsage, passphraseFrom, keyOrUsageError } from '../../services/signing/key-flags.js';
import { openSigningIdentity } from '../../services/signing/key-source.js';
import { writeOwnerOnly } from '../../services/signing/key-file.js';
import {
  createPersonalIdentity,
  exportPkcs12,
  personalKeyFileText,
} from '../../services/signing/personal-certificate.js';
import { addSignOff } from '../../services/signing/sign-off.js';
import { KeyError } from '../../services/signing/signing-identity.js';
import { signingCommandArgs, signingOptions } from '../signing-args.js';
import { exitOnInputError } from '../input-error.js';

export const usage = `Usage: limit-ledger sign STUDY --p12 FILE --signer NAME --role ROLE
         --meaning prepared|reviewed|approved [--effective DATE --review DATE --reaction-plan TEXT]
       limit-ledger sign --create-key FILE --signer NAME [--organization ORG] [--email ADDRESS]
       limit-ledger sign --export-p12 OUT.p12 --p12 KEYFILE

  Signs off the study's open revision (drafting one from the current analysis when there is none).
  The signature covers the revision's limits, method, data, decisions and the earlier sign-offs;
  approving freezes the revision.

${keyUsage}
  --signer NAME          your printed name, as it appears on the sign-off
  --role ROLE            your role, e.g. "Quality engineer"
  --meaning M            prepared, reviewed or approved (in that order, as the site requires)
  --effective DATE       the date the limits take effect (yyyy-mm-dd)
  --review DATE          the date they are to be reviewed (yyyy-mm-dd)
  --reaction-plan TEXT   what the operator does on a signal
  --create-key FILE      create a personal signing certificate (RSA 3072, self-issued), stored
                         encrypted (PBES2, 600,000 iterations, AES-256) with mode 0600
  --export-p12 OUT       export the key named by --p12 as a PKCS#12 file for other software
`;

const isoDate = /^\d{4}-\d{2}-\d{2}$/;

export const run = exitOnInputError('sign', sign, keyOrUsageError);

async function sign(argv: string[]): Promise<number> {
  const parsed = signingCommandArgs(
    argv,
    {
      ...signingOptions,
      signer: { type: 'string' },
      role: { type: 'string' },
      meaning: { type: 'string' },
      effective: { type: 'string' },
      review: { type: 'string' },
      'reaction-plan': { type: 'string' },
      'create-key': { type: 'string' },
      organization: { type: 'string' },
      email: { type: 'string' },
      'export-p12': { type: 'string' },
    },
    usage,
  );
  if (parsed === null) return 0;
  const { values, positionals } = parsed;
  if (values['create-key']) {
    if (!values.signer) throw new KeyError('--create-key needs --signer NAME, the holder’s printed name');
    const passphrase = await passphraseFrom(values, 'Passphrase for the new key: ');
    if (passphrase.length < 8)
      throw new KeyError('the passphrase of a signing key needs at least 8 characters');
    const identity = await createPersonalIdentity({
      name: values.signer,
      ...(values.organization ? { organization: values.organization } : {}),
      ...(values.email ? { email: values.email } : {}),
    });
    await writeOwnerOnly(values['create-key'], await personalKeyFileText(identity, passphrase));
    process.stdout.write(
      `created ${values['create-key']}: a self-issued signing certificate for ${identity.facts.commonName}\n  SHA-256 fingerprint ${identity.facts.fingerprint}\n`,
    );
    return 0;
  }
  if (values['export-p12']) {
    if (!values.p12) throw new KeyError('--export-p12 needs --p12 KEYFILE, the key to export');
    const passphrase = await passphraseFrom(values, 'Passphrase of the key: ');
    const identity = await openSigningIdentity(values.p12, passphrase);
    await writeOwnerOnly(values['export-p12'], await exportPkcs12(identity, passphrase));
    process.stdout.write(`exported ${values['export-p12']} (PKCS#12, same passphrase)\n`);
    return 0;
  }

  const [studyPath, ...extra] = positionals;
  if (!studyPath || extra.length > 0) throw new KeyError(`name one study file\n\n${usage}`);
  if (!values.p12) throw new KeyError('name the signing key with --p12 FILE');
  if (!values.signer || !values.role)
    throw new KeyError('give your printed name (--signer) and role (--role)');
  const meaning = signOffMeaningSchema.safeParse(values.meaning);
  if (!meaning.success)
    throw new KeyError(`--meaning must be prepared, reviewed or approved, not "${values.meaning ?? ''}"`);
  for (const flag of ['effective', 'review'] as const) {
    const value = values[flag];
    if (value !== undefined && (!isoDate.test(value) || Number.isNaN(Date.parse(value)))) {
      throw new KeyError(`--${flag} must be a date as yyyy-mm-dd, not "${value}"`);
    }
  }
  const opened = await openStudyFile(studyPath);
  if (!opened.ok) {
    process.stderr.write(opened.findings.map((f) => `limit-ledger sign: ${describeFinding(f)}\n`).join(''));
    return 2;
  }
  if (opened.value.readOnly) {
    process.stderr.write(
      `limit-ledger sign: ${studyPath}: the study’s record does not verify; it cannot be signed\n`,
    );
    return 2;
  }
  const passphrase = await passphraseFrom(values, `Passphrase for ${values.p12}: `);
  const identity = await openSigningIdentity(values.p12, passphrase);
  const now = localTime(Date.now(), -new Date().getTimezoneOffset());
  const signed = addSignOff(opened.value.study, identity, {
    printedName: values.signer,
    role: values.role,
    meaning: meaning.data,
    now,
    ...(values.effective ? { effectiveDate: values.effective } : {}),
    ...(values.review ? { reviewDate: values.review } : {}),
    ...(values['reaction-plan'] ? { reactionPlan: values['reaction-plan'] } : {}),
  });
  if (!signed.ok) {
    process.stderr.write(
      signed.findings.map((f) => `limit-ledger sign: ${studyPath}: ${describeFinding(f)}\n`).join(''),
    );
    return 2;
  }
  const saved = await saveStudyFile(studyPath, signed.value.study, {
    expectedDiskHash: opened.value.diskHash,
  });
  if (!saved.ok) {
    process.stderr.write(saved.findings.map((f) => `limit-ledger sign: ${describeFinding(f)}\n`).join(''));
    return 1;
  }
  const revision = signed.value.revision;
  process.stdout.write(
    [
      `signed revision ${revision.number} of ${studyPath} as "${meaning.data}": ${values.signer} (${values.role}), ${now}`,
      `  certificate SHA-256 ${identity.facts.fingerprint}${identity.facts.selfIssued ? ' (self-issued)' : ''}`,
      ...signed.value.notes.map((note) => `  ${note}`),
      '',
    ].join('\n'),
  );
  return 0;
}
