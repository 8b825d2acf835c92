// Job tasks for the host's job tests: plain JavaScript because a worker thread loads them as is.
import { appendFile, writeFile } from 'node:fs/promises';
import { setTimeout as sleep } from 'node:timers/promises';

export const tasks = {
  /** Writes `chunks` lines to its output, one every `delayMs`, reporting progress; honours cancel. */
  async write(input, context) {
    await writeFile(context.outputPath, '');
    for (let index = 0; index < input.chunks; index++) {
      if (context.signal.aborted) throw Object.assign(new Error('aborted'), { name: 'AbortError' });
      await appendFile(context.outputPath, `line ${index}\n`);
      context.progress((index + 1) / input.chunks, `line ${index + 1} of ${input.chunks}`);
      await sleep(input.delayMs);
    }
    return { lines: input.chunks };
  },
  /** Ignores its signal: the runner must terminate it. */
  async stubborn(input, context) {
    await writeFile(context.outputPath, 'partial');
    const until = Date.now() + input.busyMs;
    while (Date.now() < until) {
      // Busy on purpose: no await, so the cancel message is never read.
    }
    return { finished: true };
  },
  async fail() {
    throw new Error('the data file has no count column');
  },
  async echo(input) {
    return input;
  },
};
