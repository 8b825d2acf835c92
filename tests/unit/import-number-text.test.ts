import { describe, expect, it } from 'vitest';
import { parseNumberText } from '../../shared-core/import/number-text.js';
import { chooseDecimalMark } from '../../shared-core/import/decimal-mark.js';

// How numbers are written with a decimal point or a decimal comma is common practice (locale
// conventions, e.g. 1,234.5 in the US and UK, 1.234,5 in Germany, 1 234,5 in France, 1'234.5 in
// Switzerland); the expected values below follow from those conventions.
describe('parseNumberText', () => {
  it.each([
    ['12', 'point', 12],
    ['1,234.5', 'point', 1234.5],
    ['1 234.5', 'point', 1234.5],
    ["1'234.5", 'point', 1234.5],
    ['1,234,567', 'point', 1234567],
    ['1.5e3', 'point', 1500],
    ['.5', 'point', 0.5],
    ['5.', 'point', 5],
    ['-3', 'point', -3],
    ['\u22123', 'point', -3],
    ['+3', 'point', 3],
    ['  7  ', 'point', 7],
    ['1,5', 'comma', 1.5],
    ['1.234,5', 'comma', 1234.5],
    ['1\u00a0234,5', 'comma', 1234.5],
    ['1.234.567', 'comma', 1234567],
    ['0012', 'point', 12],
  ] as const)('reads %j with a decimal %s as %d', (text, decimal, expected) => {
    expect(parseNumberText(text, decimal)).toBe(expected);
  });

  it.each([
    ['', 'point'],
    ['.', 'point'],
    ['abc', 'point'],
    ['1,23', 'point'], // a thousands group has three digits
    ['1,234.567.8', 'point'],
    ['1.5', 'comma'],
    ['1,234,5', 'comma'],
    ['12%', 'point'],
    ['1 2', 'point'],
    ['0x10', 'point'],
    ['Infinity', 'point'],
  ] as const)('finds no number in %j with a decimal %s', (text, decimal) => {
    expect(parseNumberText(text, decimal)).toBeNull();
  });

  it('gives Infinity for an exponent beyond the double range, for the caller to refuse', () => {
    expect(parseNumberText('1e400', 'point')).toBe(Infinity);
  });
});

describe('chooseDecimalMark', () => {
  const cell = (row: number, text: string) => ({ row, column: 'units', text });

  it('keeps a mark the user states', () => {
    expect(chooseDecimalMark([cell(2, '1.5')], 'comma', undefined)).toMatchObject({
      decimal: 'comma',
      source: 'given',
    });
  });

  it('detects a decimal comma from a cell that reads only that way', () => {
    const choice = chooseDecimalMark([cell(2, '12'), cell(3, '1,5')], undefined, '\t');
    expect(choice).toMatchObject({ kind: 'chosen', decimal: 'comma', source: 'detected' });
  });

  it('detects a decimal point from a cell that reads only that way', () => {
    const choice = chooseDecimalMark([cell(2, '1,234'), cell(3, '2.25')], undefined, '\t');
    expect(choice).toMatchObject({ kind: 'chosen', decimal: 'point' });
  });

  it('refuses a column that mixes both marks, naming a row of each', () => {
    const choice = chooseDecimalMark([cell(2, '1,5'), cell(7, '2.25')], undefined, '\t');
    expect(choice.kind).toBe('mixed');
    expect(choice.kind === 'mixed' && choice.message).toContain('row 2');
  });

  it('asks when every cell reads both ways and the delimiter does not decide', () => {
    const choice = chooseDecimalMark([cell(4, '1,250')], undefined, '\t');
    expect(choice).toMatchObject({ kind: 'ambiguous', example: { row: 4 } });
    expect(choice.kind === 'ambiguous' && choice.message).toContain('1250 or 1.250');
  });

  it('reads a semicolon file with a decimal comma and a comma file with a decimal point', () => {
    expect(chooseDecimalMark([cell(2, '1,250')], undefined, ';')).toMatchObject({ decimal: 'comma' });
    expect(chooseDecimalMark([cell(2, '1,250')], undefined, ',')).toMatchObject({ decimal: 'point' });
  });
});
