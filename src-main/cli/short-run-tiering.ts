import { setFlagsFromString } from 'node:v8';

/** V8's interrupt budget (bytes of bytecode a function runs between tier-up checks) by default. */
export const defaultInterruptBudget = 66 * 1024;
/** Eight times the default: measured best for packets of 50 to 5,000 periods (npm run bench). */
export const shortRunInterruptBudget = 8 * defaultInterruptBudget;

/**
 * Lets functions run longer before V8 hands them to its optimizing compiler, for a command that
 * is over in a second or two.
 *
 * The optimizing compiler works on V8's background threads. While a packet is made, two worker
 * threads draw the PDF and build the workbook; on a machine with two cores the optimizing compiles
 * take the cores they need, and most finish too late to pay back before the command ends:
 * `node --trace-opt` showed about 250 functions of pdfkit, fontkit and exceljs compiled for a
 * 500-period packet, about a third of the process's CPU time. With a larger budget only the code
 * that keeps running (the tables of a long history) is optimized.
 *
 * Call before the worker threads start: V8's flags are shared by every isolate of the process, and
 * a new isolate begins with them. Only for short commands; a long-lived host keeps V8's default.
 */
export function optimizeOnlyLongRunningCode(): void {
  try {
    setFlagsFromString(`--interrupt-budget=${shortRunInterruptBudget}`);
  } catch {
    // a runtime that takes no V8 flags runs with its defaults: slower, never wrong
  }
}
