import { readFile } from 'node:fs/promises';
import { findSignatures, signPdf } from '../../services/packet/pdf-signature.js';
import { writeAtomically } from '../../services/packet/make-packet.js';
import { keyUsage, passphraseFrom, keyOrUsageError } from '../../services/signing/key-flags.js';
import { openSigningIdentity } from '../../services/signing/key-source.js';
import { KeyError } from '../../services/signing/signing-identity.js';
import { signingCommandArgs, signingOptions } from '../signing-args.js';
import { exitOnInputError } from '../input-error.js';

export const usage = `Usage: limit-ledger countersign PACKET.pdf --p12 FILE [--passphrase-env VAR] [--reason TEXT] [--out FILE]

  Adds a further signature to a signed packet as an incremental update: the bytes the earlier
  signatures cover are left as they are, so they stay valid.

${keyUsage}
  --reason TEXT          what the signature means (default: "Countersignature")
  --out FILE             write the countersigned packet here (default: replace PACKET.pdf)
`;

export const run = exitOnInputError('countersign', countersign, keyOrUsageError);

async function countersign(argv: string[]): Promise<number> {
  const parsed = signingCommandArgs(
    argv,
    {
      ...signingOptions,
      reason: { type: 'string' },
      out: { type: 'string' },
    },
    usage,
  );
  if (parsed === null) return 0;
  const { values, positionals } = parsed;
  const [pdfPath, ...extra] = positionals;
  if (!pdfPath || extra.length > 0) throw new KeyError(`name one packet PDF\n\n${usage}`);
  if (!values.p12) throw new KeyError('name the signing key with --p12 FILE');
  const pdf = await readFile(pdfPath);
  if (findSignatures(pdf).length === 0) {
    process.stderr.write(
      `limit-ledger countersign: ${pdfPath}: the PDF is not signed yet; sign it with limit-ledger packet --p12\n`,
    );
    return 2;
  }
  const identity = await openSigningIdentity(
    values.p12,
    await passphraseFrom(values, `Passphrase for ${values.p12}: `),
  );
  const signed = await signPdf(pdf, identity, { reason: values.reason ?? 'Countersignature' });
  const out = values.out ?? pdfPath;
  await writeAtomically(out, signed);
  process.stdout.write(
    `countersigned ${out} as ${identity.facts.commonName}${identity.facts.selfIssued ? ' (self-issued certificate)' : ''}; it now holds ${findSignatures(signed).length} signatures\n`,
  );
  return 0;
}
