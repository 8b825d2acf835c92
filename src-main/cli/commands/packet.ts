import { describeFinding } from '../../../shared-core/result.js';
import { localTime } from '../../../shared-core/study/local-time.js';
import type { Paper } from '../../services/packet/packet-pdf.js';
import { startPacketThreads, type PacketThreads } from '../../services/packet/packet-threads.js';
import { keyUsage, passphraseFrom, keyOrUsageError } from '../../services/signing/key-flags.js';
import { KeyError, type SigningIdentity } from '../../services/signing/signing-identity.js';
import { signingCommandArgs, signingOptions } from '../signing-args.js';
import { exitOnInputError } from '../input-error.js';
import { optimizeOnlyLongRunningCode } from '../short-run-tiering.js';

export const usage = `Usage: limit-ledger packet STUDY --pdf OUT.pdf --xlsx OUT.xlsx [--p12 FILE --passphrase-env VAR]
       [--paper a4|letter]

  Writes the approval packet of the study's revision (an open limit change, else the approved
  one, else the open draft): a PDF with the chart, limits, data, exclusions, iterations, checks,
  sign-offs and cautions, the study embedded, signed when a key is given; the workbook whose
  formulas recompute the limits; and OUT.limits.csv, OUT.limits.json and OUT.chart.svg beside it.

  When the revision supersedes approved limits (limit-ledger propose), the packet is a change
  packet, made so automatically: a "Limit change" section after the cover (the reason, the
  approved revision it replaces with its sign-offs, limits and periods, the exact rate ratio with
  its 95 % interval and p-value, old and new limits at typical k with wider ones flagged, run
  lengths, the check for a step in the rate, a before/after chart) and a "Change" sheet in the
  workbook.

  --pdf FILE         the PDF to write
  --xlsx FILE        the workbook to write (the PDF states its SHA-256)
  --paper SIZE       a4 (default) or letter
${keyUsage}
`;

export const run = exitOnInputError('packet', packet, keyOrUsageError);

async function packet(argv: string[]): Promise<number> {
  const parsed = signingCommandArgs(
    argv,
    {
      ...signingOptions,
      pdf: { type: 'string' },
      xlsx: { type: 'string' },
      paper: { type: 'string', default: 'a4' },
    },
    usage,
  );
  if (parsed === null) return 0;
  const { values, positionals } = parsed;
  const [studyPath, ...extra] = positionals;
  if (!studyPath || extra.length > 0) throw new KeyError(`name one study file\n\n${usage}`);
  if (!values.pdf || !values.xlsx) throw new KeyError('name both outputs: --pdf OUT.pdf --xlsx OUT.xlsx');
  const paper = values.paper.toLowerCase();
  if (paper !== 'a4' && paper !== 'letter')
    throw new KeyError(`--paper must be a4 or letter, not "${values.paper}"`);
  optimizeOnlyLongRunningCode();
  // The workbook's and the PDF's threads start before the modules that open the study and the
  // key load here (imported only now), so that exceljs and pdfkit load beside them.
  const threads = startPacketThreads();
  try {
    const key = values.p12
      ? { path: values.p12, passphrase: await passphraseFrom(values, `Passphrase for ${values.p12}: `) }
      : undefined;
    return await writePacket({ studyPath, pdfPath: values.pdf, xlsxPath: values.xlsx, paper, threads }, key);
  } finally {
    await threads.stop();
  }
}

async function writePacket(
  request: { studyPath: string; pdfPath: string; xlsxPath: string; paper: Paper; threads: PacketThreads },
  key: { path: string; passphrase: string } | undefined,
): Promise<number> {
  // The key opens (600,000 PBKDF2 iterations, off the main thread) while the PDF is drawn, once the
  // workbook is built (makePacket calls openKey); the signature waits for it, the drawing does not.
  let identity: Promise<SigningIdentity> | undefined;
  const openKey = key
    ? () =>
        (identity = import('../../services/signing/key-source.js').then(({ openSigningIdentity }) =>
          openSigningIdentity(key.path, key.passphrase),
        ))
    : undefined;
  const tty = process.stderr.isTTY;
  const { makePacket } = await import('../../services/packet/make-packet.js');
  const made = await makePacket({
    ...request,
    now: localTime(Date.now(), -new Date().getTimezoneOffset()),
    ...(openKey ? { identity: openKey } : {}),
    ...(tty
      ? {
          onProgress: (fraction: number, what: string) =>
            process.stderr.write(`\r  making the packet: ${what.padEnd(10)} ${Math.round(fraction * 100)} %`),
        }
      : {}),
  });
  if (tty) process.stderr.write('\n');
  if (!made.ok) {
    process.stderr.write(made.findings.map((f) => `limit-ledger packet: ${describeFinding(f)}\n`).join(''));
    return 2;
  }
  const signer = identity ? await identity : undefined;
  process.stdout.write(
    [
      `wrote ${made.value.join(', ')}`,
      signer
        ? `  the PDF is signed by ${signer.facts.commonName}${signer.facts.selfIssued ? ' (self-issued certificate)' : ''}`
        : '  the PDF is not signed (give --p12 to sign it)',
      '',
    ].join('\n'),
  );
  return 0;
}
