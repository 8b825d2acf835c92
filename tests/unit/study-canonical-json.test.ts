import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { canonicalJson } from '../../shared-core/study/canonical-json.js';

const require = createRequire(import.meta.url);
// The canonicalize package (RFC 8785, by one of its authors) is the independent reference.
const canonicalize = require('canonicalize') as (value: unknown) => string | undefined;
const referenceData = join(dirname(require.resolve('canonicalize')), '..', 'test', 'testdata');

const fromBits = (hex: string): number => {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${hex}`));
  return view.getFloat64(0);
};

describe('canonicalJson (RFC 8785)', () => {
  it('matches the RFC 8785 §3.2.2 example of values (from memory, confirmed by the canonicalize package data)', () => {
    const input = JSON.parse(
      '{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],' +
        ' "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/", "literals": [null, true, false]}',
    );
    expect(canonicalJson(input)).toBe(
      '{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],' +
        '"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}',
    );
  });

  it('sorts keys by UTF-16 code units as the RFC 8785 §3.2.3 example does (from memory)', () => {
    const input = {
      '€': 'Euro Sign',
      '\r': 'Carriage Return',
      '\ufb33': 'Hebrew Letter Dalet With Dagesh',
      '1': 'One',
      '\ud83d\ude00': 'Emoji: Grinning Face',
      '\u0080': 'Control',
      ö: 'Latin Small Letter O With Diaeresis',
    };
    expect(canonicalJson(input)).toBe(
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","ö":"Latin Small Letter O With Diaeresis",' +
        '"€":"Euro Sign","\ud83d\ude00":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}',
    );
  });

  it('prints numbers as RFC 8785 Appendix B lists them (IEEE 754 bit patterns, from memory)', () => {
    const cases: [string, string][] = [
      ['0000000000000000', '0'],
      ['8000000000000000', '0'],
      ['0000000000000001', '5e-324'],
      ['8000000000000001', '-5e-324'],
      ['7fefffffffffffff', '1.7976931348623157e+308'],
      ['4340000000000000', '9007199254740992'],
      ['c340000000000000', '-9007199254740992'],
      ['4430000000000000', '295147905179352830000'],
      ['44b52d02c7e14af5', '9.999999999999997e+22'],
      ['44b52d02c7e14af6', '1e+23'],
      ['3eb0c6f7a0b5ed8d', '0.000001'],
      ['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
      ['41b3de4355555556', '333333333.3333334'],
    ];
    for (const [bits, text] of cases) expect(canonicalJson(fromBits(bits))).toBe(text);
  });

  it('refuses values JSON cannot carry', () => {
    expect(() => canonicalJson(Number.NaN)).toThrow(/no JSON form/);
    expect(() => canonicalJson({ a: [Infinity] })).toThrow(/\$\.a\[0\]/);
    expect(() => canonicalJson([undefined])).toThrow(/undefined/);
    expect(() => canonicalJson(new Date(0))).toThrow(/plain objects/);
    expect(canonicalJson({ a: undefined, b: 1 })).toBe('{"b":1}');
  });

  it('agrees with every case of the canonicalize package test data (RFC 8785 reference cases)', () => {
    const names = readdirSync(join(referenceData, 'input'));
    expect(names.length).toBeGreaterThanOrEqual(5);
    for (const name of names) {
      const input = JSON.parse(readFileSync(join(referenceData, 'input', name), 'utf8'));
      const expected = readFileSync(join(referenceData, 'output', name), 'utf8').trim();
      expect(canonicalJson(input), name).toBe(expected);
    }
  });

  it('keeps a member named __proto__, as JSON.parse makes it (found by the random test below)', () => {
    for (const text of ['{"__proto__":null}', '{"b":2,"__proto__":{"x":[1]},"a":"1"}', '[{"__proto__":7}]']) {
      const value = JSON.parse(text);
      expect(canonicalJson(value)).toBe(canonicalize(value));
      expect(canonicalJson(value)).toContain('"__proto__":');
    }
    expect(canonicalJson(JSON.parse('{"__proto__":null}'))).not.toBe(canonicalJson({}));
  });

  it('agrees with the canonicalize package on random JSON values', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        expect(canonicalJson(value)).toBe(canonicalize(value));
      }),
      { numRuns: 2000 },
    );
  });
});
