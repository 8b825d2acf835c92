import { describe, expect, it } from 'vitest';
import { perWhat, scaleTitle, unitsInWords } from '../../shared-core/view/scale-words.js';

// English plural rules (common practice): -s, -es after s/x/z/ch/sh, consonant + y → -ies.
describe('unitsInWords', () => {
  it('pluralises the last word of the unit', () => {
    expect(unitsInWords(5, 'panel', 'en-US')).toBe('5 panels');
    expect(unitsInWords(3, 'box', 'en-US')).toBe('3 boxes');
    expect(unitsInWords(2, 'wire harness', 'en-US')).toBe('2 wire harnesses');
    expect(unitsInWords(4, 'assembly', 'en-US')).toBe('4 assemblies');
    expect(unitsInWords(4, 'tray', 'en-US')).toBe('4 trays');
    expect(unitsInWords(10, 'inspection unit', 'en-US')).toBe('10 inspection units');
  });

  it('keeps one unit singular and drops a leading "one" or article', () => {
    expect(unitsInWords(1, 'one board', 'en-US')).toBe('1 board');
    expect(unitsInWords(6, 'one board', 'en-US')).toBe('6 boards');
    expect(unitsInWords(6, 'a casting', 'en-US')).toBe('6 castings');
  });

  it('multiplies a unit that carries its own quantity or an "of" phrase', () => {
    expect(unitsInWords(2, '50 m² of cloth', 'en-US')).toBe('2 × 50 m² of cloth');
    expect(unitsInWords(3, 'roll of film', 'en-US')).toBe('3 × roll of film');
  });

  it('writes k in the locale', () => {
    expect(unitsInWords(1200, 'label', 'en-US')).toBe('1,200 labels');
    expect(unitsInWords(1200, 'label', 'de-DE')).toBe('1.200 labels');
    expect(unitsInWords(2.5, 'sheet', 'de-DE')).toBe('2,5 sheets');
  });

  it('falls back to "inspection unit" when no unit is named', () => {
    expect(unitsInWords(5, '  ', 'en-US')).toBe('5 inspection units');
  });
});

describe('perWhat and scaleTitle', () => {
  it('reads per unit on a u chart and per inspection of k units on a c chart', () => {
    expect(perWhat('u', 'panel', 5, 'en-US')).toBe('per panel');
    expect(perWhat('c', 'panel', 5, 'en-US')).toBe('per inspection of 5 panels');
    expect(perWhat('c', 'one board', 1, 'en-US')).toBe('per inspection of 1 board');
    expect(scaleTitle('u', 'one board', 8, 'en-US')).toBe('Nonconformities per board');
    expect(scaleTitle('c', 'panel', 5, 'en-US')).toBe('Nonconformities per inspection of 5 panels');
  });
});
