import { readFile } from 'node:fs/promises';
import { X509Certificate } from 'node:crypto';
import { parseArgs } from 'node:util';
import { verifyPacket } from '../../services/packet/packet-verify.js';

export const usage = `Usage: limit-ledger verify PACKET.pdf [--workbook BOOK.xlsx] [--trust CERT]...

  Checks every signature of the packet over its byte range, that nothing but further signatures
  was added after signing, the embedded study's audit chain and sign-offs, recomputes the limits
  with the core and compares them with what the PDF and the workbook state. Exit status 0 only
  when everything holds, 1 when something does not, 2 for a usage error.

  --workbook FILE   the workbook exported with the packet (its SHA-256 must match the PDF's)
  --trust CERT      a certificate (PEM or DER) whose holder, or whose certificates, you trust;
                    without it, signers are reported as self-issued or untrusted
`;

export async function run(argv: string[]): Promise<number> {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      strict: true,
      allowPositionals: true,
      options: {
        workbook: { type: 'string' },
        trust: { type: 'string', multiple: true },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (error) {
    process.stderr.write(`limit-ledger verify: ${(error as Error).message}\n\n${usage}`);
    return 2;
  }
  const { values, positionals } = parsed;
  if (values.help) {
    process.stdout.write(usage);
    return 0;
  }
  if (positionals.length !== 1) {
    process.stderr.write(`limit-ledger verify: name one packet PDF\n\n${usage}`);
    return 2;
  }
  const read = async (path: string, what: string) => {
    try {
      return await readFile(path);
    } catch (error) {
      throw new Error(
        `${path}: the ${what} cannot be read (${(error as NodeJS.ErrnoException).code ?? 'error'})`,
        { cause: error },
      );
    }
  };
  let pdf: Buffer;
  let workbook: Buffer | undefined;
  const trusted: Buffer[] = [];
  try {
    pdf = await read(positionals[0]!, 'packet');
    if (values.workbook) workbook = await read(values.workbook, 'workbook');
    for (const path of values.trust ?? []) {
      const bytes = await read(path, 'certificate');
      try {
        trusted.push(Buffer.from(new X509Certificate(bytes).raw));
      } catch (error) {
        throw new Error(`${path}: not a certificate (PEM or DER)`, { cause: error });
      }
    }
  } catch (error) {
    process.stderr.write(`limit-ledger verify: ${(error as Error).message}\n`);
    return 2;
  }
  const verdict = await verifyPacket({ pdf, ...(workbook ? { workbook } : {}), trusted });
  const out = verdict.lines.map((line) => `${line.ok ? '  ok ' : '  NO '} ${line.text}`);
  if (
    trusted.length === 0 &&
    verdict.lines.some((line) => /not in the trusted list|not trusted/.test(line.text))
  ) {
    out.push(
      '  (name the certificates you trust with --trust CERT to check who signed, not only that nothing changed)',
    );
  }
  out.push(
    verdict.ok
      ? `VERIFIED: ${positionals[0]} holds.`
      : `NOT VERIFIED: ${positionals[0]} fails ${verdict.lines.filter((l) => !l.ok).length} check(s).`,
  );
  process.stdout.write(out.join('\n') + '\n');
  return verdict.ok ? 0 : 1;
}
