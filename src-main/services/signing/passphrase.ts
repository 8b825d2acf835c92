import { readSync } from 'node:fs';
import { KeyError } from './signing-identity.js';

/**
 * Where a passphrase comes from. Never a command-line value: those end up in shell history and in
 * every other user's process list.
 */
export type PassphraseSource =
  { kind: 'env'; variable: string } | { kind: 'fd'; fd: number } | { kind: 'prompt'; question: string };

export interface PromptStreams {
  input: NodeJS.ReadStream;
  output: NodeJS.WriteStream;
}

export async function readPassphrase(
  source: PassphraseSource,
  environment: NodeJS.ProcessEnv = process.env,
  streams: PromptStreams = { input: process.stdin, output: process.stderr },
): Promise<string> {
  switch (source.kind) {
    case 'env': {
      const value = environment[source.variable];
      if (value === undefined || value === '') {
        throw new KeyError(`the environment variable ${source.variable} holds no passphrase`);
      }
      return value;
    }
    case 'fd':
      return stripNewline(readAll(source.fd));
    case 'prompt':
      return prompt(source.question, streams);
  }
}

function readAll(fd: number): string {
  const chunks: Buffer[] = [];
  const chunk = Buffer.alloc(4096);
  for (;;) {
    let read: number;
    try {
      read = readSync(fd, chunk, 0, chunk.length, null);
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EAGAIN') continue;
      if (code === 'EOF') break;
      throw new KeyError(`file descriptor ${fd} cannot be read (${code ?? 'error'})`);
    }
    if (read === 0) break;
    chunks.push(Buffer.from(chunk.subarray(0, read)));
  }
  chunk.fill(0);
  const text = Buffer.concat(chunks).toString('utf8');
  if (text.length === 0) throw new KeyError(`file descriptor ${fd} gave no passphrase`);
  return text;
}

const stripNewline = (text: string) => text.replace(/\r?\n$/, '');

/** Asks on the terminal without echoing what is typed. */
function prompt(question: string, { input, output }: PromptStreams): Promise<string> {
  if (!input.isTTY) {
    return Promise.reject(
      new KeyError('no terminal to ask for the passphrase; use --passphrase-env VAR or --passphrase-fd N'),
    );
  }
  output.write(question);
  return new Promise((resolve, reject) => {
    let typed = '';
    input.setRawMode(true);
    input.resume();
    const finish = (error?: Error) => {
      input.setRawMode(false);
      input.pause();
      input.off('data', onData);
      output.write('\n');
      if (error) reject(error);
      else resolve(typed);
    };
    const onData = (data: Buffer) => {
      for (const character of data.toString('utf8')) {
        if (character === '\r' || character === '\n') return finish();
        if (character === '\u0003') return finish(new KeyError('cancelled'));
        if (character === '\u007f' || character === '\b') typed = typed.slice(0, -1);
        else typed += character;
      }
    };
    input.on('data', onData);
  });
}
