import { setFlagsFromString } from 'node:v8';

/**
 * V8's flag for how long a function runs before its optimizing compiler takes it, by V8's major
 * version, with eight times its default: measured best for packets of 50 to 5,000 periods
 * (npm run bench). V8 11 (Node 20) counts bytes of bytecode run (default 66 KiB); V8 12 and 13
 * (Node 22 and 24) count invocations before TurboFan (default 3,000) and tier up through Maglev
 * first, which is left as it is. V8 prints an error for a flag it does not know, so a version not
 * listed here gets no flag.
 */
export function shortRunTieringFlag(v8Version: string): string | null {
  const major = Number(v8Version.split('.')[0]);
  if (major === 11) return `--interrupt-budget=${8 * 66 * 1024}`;
  if (major === 12 || major === 13) return `--invocation-count-for-turbofan=${8 * 3000}`;
  return null;
}

/**
 * Lets functions run longer before V8 hands them to its optimizing compiler, for a command that
 * is over in a second or two.
 *
 * The optimizing compiler works on V8's background threads. While a packet is made, two worker
 * threads draw the PDF and build the workbook; on a machine with two cores the optimizing compiles
 * take the cores they need, and most finish too late to pay back before the command ends:
 * `node --trace-opt` showed about 250 functions of pdfkit, fontkit and exceljs compiled for a
 * 500-period packet, about a third of the process's CPU time. With a later tier-up only the code
 * that keeps running (the tables of a long history) is optimized.
 *
 * Call before the worker threads start: V8's flags are shared by every isolate of the process, and
 * a new isolate begins with them. Only for short commands; a long-lived host keeps V8's default.
 */
export function optimizeOnlyLongRunningCode(): void {
  const flag = shortRunTieringFlag(process.versions.v8);
  if (flag) setFlagsFromString(flag);
}
