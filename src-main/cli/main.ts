/**
 * The `limit-ledger` command: a table of subcommands, each loaded only when it runs so that a
 * quick `analyze` does not pay for PDF, workbook or server code.
 */
export interface Command {
  summary: string;
  load: () => Promise<{ run: (argv: string[]) => Promise<number> }>;
}

export const commands: Record<string, Command> = {
  analyze: {
    summary: 'analyze a history of counts: limits, signals, checks (--json for programs)',
    load: () => import('./commands/analyze.js'),
  },
  serve: {
    summary: 'open the app in your browser, on 127.0.0.1 only',
    load: () => import('./commands/serve.js'),
  },
  demo: { summary: 'write a demo study of an invented scenario', load: () => import('./commands/demo.js') },
  sign: {
    summary: 'sign off a study revision (prepared, reviewed, approved) with your key',
    load: () => import('./commands/sign.js'),
  },
  packet: {
    summary: 'write the approval packet: signed PDF, workbook, limits CSV/JSON, chart SVG',
    load: () => import('./commands/packet.js'),
  },
  countersign: {
    summary: 'add a further signature to a signed packet PDF',
    load: () => import('./commands/countersign.js'),
  },
  verify: {
    summary: 'check a packet: signatures, embedded study, recomputed limits, workbook',
    load: () => import('./commands/verify.js'),
  },
  compare: {
    summary: 'compare the rate in new data with a base: exact ratio, interval and test',
    load: () => import('./commands/compare.js'),
  },
  arl: {
    summary: 'average run lengths of the limits: in control and after rises in the rate',
    load: () => import('./commands/arl.js'),
  },
  check: {
    summary: 'judge new periods against the approved limits of a study, without recomputing',
    load: () => import('./commands/check.js'),
  },
  propose: {
    summary: 'propose a change of a study’s approved limits: add new periods, reason, draft revision',
    load: () => import('./commands/propose.js'),
  },
};

export function helpText(): string {
  const width = Math.max(...Object.keys(commands).map((name) => name.length));
  const lines = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(width)}  ${c.summary}`);
  return [
    'Limit Ledger: Phase I baseline studies of nonconformity counts (c and u charts).',
    '',
    'Usage: limit-ledger <command> [options]',
    '',
    'Commands:',
    ...lines,
    '',
    'Run `limit-ledger <command> --help` for a command’s options.',
    '',
  ].join('\n');
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(helpText());
    return name === undefined ? 2 : 0;
  }
  if (name === '--version') {
    process.stdout.write('limit-ledger 0.1.0\n');
    return 0;
  }
  const command = commands[name];
  if (command === undefined) {
    process.stderr.write(`limit-ledger: unknown command "${name}"\n\n${helpText()}`);
    return 2;
  }
  const module = await command.load();
  return module.run(rest);
}
