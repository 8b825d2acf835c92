import { describe, expect, it } from 'vitest';
import { findSignals } from '../../shared-core/rules/find-signals.js';
import { parseRuleList } from '../../shared-core/rules/rule-catalog.js';
import type { RuleId } from '../../shared-core/study/analysis-types.js';

// The rule definitions are DESIGN.md's table (Western Electric Handbook 1956; Nelson, JQT 16(4), 1984).
const points = (z: number[]) => ({ z, beyond: z.map((value) => Math.abs(value) > 3) });
const firedAt = (z: number[], rule: RuleId) =>
  findSignals(points(z), [rule]).flatMap((ids, t) => (ids.length > 0 ? [t] : []));

describe('signal rules', () => {
  it('beyond fires only where the limit is crossed', () => {
    expect(firedAt([0, 3.5, -2, -3.2, 3], 'beyond')).toEqual([1, 3]);
  });

  it('zone-a needs 2 of 3 beyond 2 on the same side, and the last of them at t', () => {
    expect(firedAt([2.5, 0, 2.1], 'zone-a')).toEqual([2]);
    expect(firedAt([2.5, 2.1, 0], 'zone-a')).toEqual([]); // t = 1: window incomplete; t = 2: z = 0
    expect(firedAt([0, 2.5, 2.1, 0], 'zone-a')).toEqual([2]);
    expect(firedAt([2.5, 0, -2.1], 'zone-a')).toEqual([]);
    expect(firedAt([2, 0, 2], 'zone-a')).toEqual([]); // strict: z = 2 is not beyond 2
  });

  it('zone-b needs 4 of 5 beyond 1 on the same side', () => {
    expect(firedAt([1.5, 1.2, 0, 1.1, 1.3], 'zone-b')).toEqual([4]);
    expect(firedAt([1.5, 1.2, 0, 1.1, -1.3], 'zone-b')).toEqual([]);
    expect(firedAt([-1.5, -1.2, -1.1, -1.3, -1.01], 'zone-b')).toEqual([4]);
  });

  it('run:8 fires at the 8th, 9th and 10th periods of a run of 10; z = 0 breaks a run', () => {
    const run = [0.5, 0.1, 0.2, 0.3, 0.2, 0.1, 0.4, 0.2, 0.3, 0.1];
    expect(firedAt(run, 'run:8')).toEqual([7, 8, 9]);
    expect(firedAt(run, 'run:9')).toEqual([8, 9]);
    const broken = [...run];
    broken[4] = 0;
    expect(firedAt(broken, 'run:8')).toEqual([]);
  });

  it('trend needs 6 strictly increasing or decreasing values; a tie breaks it', () => {
    expect(firedAt([-1, -0.5, 0, 0.5, 1, 1.5, 2], 'trend')).toEqual([5, 6]);
    expect(firedAt([3, 2, 1, 0, -1, -2], 'trend')).toEqual([5]);
    expect(firedAt([-1, -0.5, 0, 0, 1, 1.5], 'trend')).toEqual([]);
  });

  it('alternate needs 14 values alternating up and down', () => {
    const zigzag = Array.from({ length: 14 }, (_, i) => (i % 2 === 0 ? -0.5 : 0.5));
    expect(firedAt(zigzag, 'alternate')).toEqual([13]);
    expect(firedAt(zigzag.slice(0, 13), 'alternate')).toEqual([]);
    const tie = [...zigzag];
    tie[7] = tie[6];
    expect(firedAt(tie, 'alternate')).toEqual([]);
  });

  it('hug needs 15 values all within ±1 (strictly)', () => {
    const close = Array.from({ length: 15 }, (_, i) => (i % 3) * 0.3 - 0.3);
    expect(firedAt(close, 'hug')).toEqual([14]);
    expect(firedAt([...close.slice(0, 14), 1], 'hug')).toEqual([]);
  });

  it('avoid needs 8 values all beyond ±1 with both sides present', () => {
    const mixed = [1.5, -1.2, 1.1, -2, 1.3, -1.4, 1.6, -1.1];
    expect(firedAt(mixed, 'avoid')).toEqual([7]);
    expect(firedAt(mixed.map(Math.abs), 'avoid')).toEqual([]);
  });

  it('reads rule lists: run means run:8, all means every rule, unknown names are reported', () => {
    expect(parseRuleList('beyond, run')).toEqual({ rules: ['beyond', 'run:8'] });
    expect(parseRuleList('beyond,run:9')).toEqual({ rules: ['beyond', 'run:9'] });
    expect(parseRuleList('beyond,wiggle')).toEqual({ unknown: ['wiggle'] });
    const all = parseRuleList('all');
    expect('rules' in all && all.rules.length).toBe(8);
  });
});
