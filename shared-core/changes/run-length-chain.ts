import { fail, ok, type Result } from '../result.js';
import type { RuleId } from '../study/analysis-types.js';

/**
 * What the signal rules see of one period, reduced to the comparisons they make (DESIGN.md, "Signal
 * rules"; strict inequalities throughout).
 */
export interface PointSymbol {
  /** The count is beyond its reported limit (above UCL, or below an LCL that exists). */
  beyond: boolean;
  /** +1 when z > 2, −1 when z < −2, else 0. */
  zoneA: -1 | 0 | 1;
  /** +1 when z > 1, −1 when z < −1, else 0. */
  zoneB: -1 | 0 | 1;
  /** The sign of z (0 when z = 0 exactly, which breaks a run). */
  side: -1 | 0 | 1;
  /** |z| < 1. */
  inner: boolean;
}

/** A per-point probability model: each symbol with its probability (they sum to 1). */
export interface SymbolProbability {
  symbol: PointSymbol;
  probability: number;
}

/** The rules whose state depends only on the symbols above; trend and alternate compare values. */
export const chainRules: readonly RuleId[] = ['beyond', 'zone-a', 'zone-b', 'run:8', 'run:9', 'hug', 'avoid'];

/** Beyond this many states (after minimization) the dense solve would take too long to be useful. */
export const maxChainStates = 2500;
const maxRawStates = 400_000;

/** One rule as a small deterministic automaton over symbols; states are small integers. */
interface RuleAutomaton {
  start: number;
  /** The next state, or −1 when the rule fires at this point. */
  step(state: number, symbol: PointSymbol): number;
}

const beyondAutomaton: RuleAutomaton = { start: 0, step: (_, symbol) => (symbol.beyond ? -1 : 0) };

/**
 * `hits` of the `length` periods ending at t beyond a zone on the same side, t one of them, and
 * only once `length` periods have been seen (the rule needs a complete window). State: how many
 * periods were seen (capped at length − 1) and the zone side of the last length − 1 periods.
 * `fullWindows` starts as if length − 1 quiet periods came first (the chains of Champ & Woodall).
 */
function zoneAutomaton(
  length: number,
  hits: number,
  field: 'zoneA' | 'zoneB',
  fullWindows: boolean,
): RuleAutomaton {
  const keep = length - 1;
  const base = 3 ** keep;
  return {
    start: fullWindows ? keep * base : 0,
    step(state, symbol) {
      const seen = Math.floor(state / base);
      let history = state % base;
      const value = symbol[field];
      const code = value === 1 ? 1 : value === -1 ? 2 : 0;
      if (seen >= keep && code !== 0) {
        let count = 1;
        for (let h = history, j = 0; j < keep; j++, h = Math.floor(h / 3)) if (h % 3 === code) count++;
        if (count >= hits) return -1;
      }
      history = (history * 3 + code) % base;
      return Math.min(seen + 1, keep) * base + history;
    },
  };
}

/** `run:N`: the signed length of the current run on one side of the center. */
function runAutomaton(length: number): RuleAutomaton {
  const offset = length;
  return {
    start: offset,
    step(state, symbol) {
      const run = state - offset;
      const next =
        symbol.side === 1 ? (run > 0 ? run + 1 : 1) : symbol.side === -1 ? (run < 0 ? run - 1 : -1) : 0;
      return Math.abs(next) >= length ? -1 : next + offset;
    },
  };
}

/** `hug`: the length of the current run of |z| < 1. */
const hugAutomaton: RuleAutomaton = {
  start: 0,
  step: (state, symbol) => (symbol.inner ? (state + 1 >= 15 ? -1 : state + 1) : 0),
};

/**
 * `avoid`: the length of the current run of |z| > 1 (capped at 7) and how many periods ago the
 * last one above and the last one below the center came (8 = not within the run's last 8).
 */
const avoidAutomaton: RuleAutomaton = {
  start: 0,
  step(state, symbol) {
    if (symbol.zoneB === 0) return 0;
    const run = Math.floor(state / 81);
    const upAge = Math.floor(state / 9) % 9;
    const downAge = state % 9;
    const up = symbol.zoneB === 1 ? 0 : Math.min(run === 0 ? 8 : upAge + 1, 8);
    const down = symbol.zoneB === -1 ? 0 : Math.min(run === 0 ? 8 : downAge + 1, 8);
    if (run + 1 >= 8 && up <= 7 && down <= 7) return -1;
    return Math.min(run + 1, 7) * 81 + up * 9 + down;
  },
};

function automatonFor(rule: RuleId, fullWindows = false): RuleAutomaton | null {
  switch (rule) {
    case 'beyond':
      return beyondAutomaton;
    case 'zone-a':
      return zoneAutomaton(3, 2, 'zoneA', fullWindows);
    case 'zone-b':
      return zoneAutomaton(5, 4, 'zoneB', fullWindows);
    case 'run:8':
      return runAutomaton(8);
    case 'run:9':
      return runAutomaton(9);
    case 'hug':
      return hugAutomaton;
    case 'avoid':
      return avoidAutomaton;
    default:
      return null;
  }
}

/**
 * The run-length chain of a rule set: the transient states (minimal: two histories that lead to a
 * signal at exactly the same future points are one state) and, for each state and symbol, the next
 * state or −1 for a signal.
 */
export interface RunLengthChain {
  rules: RuleId[];
  symbols: PointSymbol[];
  /** transitions[state·symbols.length + symbol] */
  transitions: Int32Array;
  states: number;
  start: number;
}

export interface ChainOptions {
  /**
   * Let the zone rules count from the first period as if quiet periods came before it, as the
   * published chains do. Default false: a zone rule needs a complete window, as the rules of
   * DESIGN.md (and so the Review screen) apply them.
   */
  fullWindows?: boolean;
}

export function symbolKey(symbol: PointSymbol): string {
  return `${symbol.beyond ? 1 : 0}${symbol.zoneA}${symbol.zoneB}${symbol.side}${symbol.inner ? 1 : 0}`;
}

/**
 * Builds the chain of the selected rules over the given symbols: the product of the rules' own
 * automata, explored from the first period, then minimized by Moore's partition refinement so that
 * states carry only what the selected rules need.
 *
 * Source: M. Champ & W. Woodall, "Exact results for Shewhart control charts with supplementary runs
 * rules", Technometrics 29(4), 1987 (the Markov chain of a rule set); E. F. Moore, "Gedanken-
 * experiments on sequential machines" (1956), for the minimization.
 */
export function runLengthChain(
  rules: readonly RuleId[],
  symbols: readonly PointSymbol[],
  options: ChainOptions = {},
): Result<RunLengthChain> {
  const unique = [...new Set(rules)];
  const unsupported = unique.filter((rule) => automatonFor(rule) === null);
  if (unsupported.length > 0)
    return fail({
      message: `the exact run-length chain covers the rules ${chainRules.join(', ')}; ${unsupported.join(
        ' and ',
      )} compare successive values, so no exact average run length is given for them`,
    });
  if (unique.length === 0) return fail({ message: 'select at least one signal rule' });
  const automata = unique.map((rule) => automatonFor(rule, options.fullWindows) as RuleAutomaton);
  const width = symbols.length;

  const ids = new Map<string, number>();
  const tuples: number[][] = [];
  const raw: number[] = [];
  const startTuple = automata.map((a) => a.start);
  ids.set(startTuple.join(','), 0);
  tuples.push(startTuple);
  for (let state = 0; state < tuples.length; state++) {
    const tuple = tuples[state];
    for (const symbol of symbols) {
      const next: number[] = [];
      let fires = false;
      for (let r = 0; r < automata.length; r++) {
        const s = automata[r].step(tuple[r], symbol);
        if (s < 0) fires = true;
        next.push(s);
      }
      if (fires) {
        raw.push(-1);
        continue;
      }
      const key = next.join(',');
      let id = ids.get(key);
      if (id === undefined) {
        id = tuples.length;
        if (id >= maxRawStates)
          return fail({
            message: `the rules ${unique.join(', ')} need more than ${maxRawStates} chain states`,
          });
        ids.set(key, id);
        tuples.push(next);
      }
      raw.push(id);
    }
  }

  const { classes, count } = minimizeStates(raw, tuples.length, width);
  if (count > maxChainStates)
    return fail({
      message: `the rules ${unique.join(', ')} need a chain of ${count} states, more than the ${maxChainStates} that can be solved exactly here; choose fewer rules`,
    });
  const transitions = new Int32Array(count * width);
  const done = new Uint8Array(count);
  for (let state = 0; state < tuples.length; state++) {
    const c = classes[state];
    if (done[c]) continue;
    done[c] = 1;
    for (let j = 0; j < width; j++) {
      const target = raw[state * width + j];
      transitions[c * width + j] = target < 0 ? -1 : classes[target];
    }
  }
  return ok({ rules: unique, symbols: [...symbols], transitions, states: count, start: classes[0] });
}

/** Moore's refinement: split classes until every member of a class goes to the same classes. */
function minimizeStates(raw: readonly number[], states: number, width: number) {
  let classes = new Int32Array(states);
  let count = 1;
  for (;;) {
    const signatures = new Map<string, number>();
    const next = new Int32Array(states);
    for (let s = 0; s < states; s++) {
      let signature = `${classes[s]}`;
      for (let j = 0; j < width; j++) {
        const target = raw[s * width + j];
        signature += `,${target < 0 ? -1 : classes[target]}`;
      }
      let id = signatures.get(signature);
      if (id === undefined) signatures.set(signature, (id = signatures.size));
      next[s] = id;
    }
    classes = next;
    if (signatures.size === count) return { classes, count };
    count = signatures.size;
  }
}

/**
 * The average run length from the first period: the expected number of periods until the first
 * signal, solving (I − Q)·L = 1 over the transient states, with Q the transition probabilities of
 * the chain under the given per-symbol probabilities. The diagonal of I − Q is summed from the
 * probabilities of leaving a state (not 1 − the probability of staying), so a signal probability of
 * 1e-9 keeps its digits. +∞ when no signal can ever come.
 *
 * Source: Champ & Woodall (1987), Technometrics 29(4): ARL = eᵀ(I − Q)⁻¹1 from the initial state.
 */
export function averageRunLengthOfChain(chain: RunLengthChain, probabilities: readonly number[]): number {
  const n = chain.states;
  const width = chain.symbols.length;
  const a = new Float64Array(n * n);
  const b = new Float64Array(n).fill(1);
  for (let s = 0; s < n; s++) {
    let leave = 0;
    for (let j = 0; j < width; j++) {
      const p = probabilities[j];
      if (p === 0) continue;
      const target = chain.transitions[s * width + j];
      if (target === s) continue;
      leave += p;
      if (target >= 0) a[s * n + target] -= p;
    }
    a[s * n + s] = leave;
  }
  const solution = solveDense(a, b, n);
  const arl = solution[chain.start];
  return Number.isFinite(arl) && arl > 0 ? arl : Number.POSITIVE_INFINITY;
}

/** Gaussian elimination with partial pivoting on a dense n×n system (row-major); overwrites a, b. */
function solveDense(a: Float64Array, b: Float64Array, n: number): Float64Array {
  const columns = new Int32Array(n);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    let best = Math.abs(a[col * n + col]);
    for (let r = col + 1; r < n; r++) {
      const v = Math.abs(a[r * n + col]);
      if (v > best) {
        best = v;
        pivot = r;
      }
    }
    if (best === 0) {
      b.fill(Number.POSITIVE_INFINITY);
      return b;
    }
    if (pivot !== col) {
      for (let c = col; c < n; c++) {
        const t = a[col * n + c];
        a[col * n + c] = a[pivot * n + c];
        a[pivot * n + c] = t;
      }
      const t = b[col];
      b[col] = b[pivot];
      b[pivot] = t;
    }
    const diagonal = a[col * n + col];
    // The chain's rows are sparse and stay fairly sparse: update only the pivot row's nonzeros.
    let nonzeros = 0;
    for (let c = col + 1; c < n; c++) if (a[col * n + c] !== 0) columns[nonzeros++] = c;
    for (let r = col + 1; r < n; r++) {
      const factor = a[r * n + col] / diagonal;
      if (factor === 0) continue;
      a[r * n + col] = 0;
      for (let j = 0; j < nonzeros; j++) {
        const c = columns[j];
        a[r * n + c] -= factor * a[col * n + c];
      }
      b[r] -= factor * b[col];
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let sum = b[r];
    for (let c = r + 1; c < n; c++) sum -= a[r * n + c] * x[c];
    x[r] = sum / a[r * n + r];
  }
  return x;
}
