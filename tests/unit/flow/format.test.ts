import { describe, expect, it } from 'vitest';
import { formatConcise, formatMeasurement, formatNumber, formatUncertainty, formatValueAt, messageParts } from '../../../flow/format';
import { one, onFlow } from './helpers';

/** The decimal place (power of ten) of the last digit written in a number such as 0.0625000 or 1.23e-8. */
function lastPlace(text: string): number {
  const [mantissa, exponent = '0'] = text.split('e');
  const decimals = mantissa!.includes('.') ? mantissa!.split('.')[1]!.length : 0;
  return Number(exponent) - decimals;
}

describe('a measured value is written to the digit its uncertainty reaches', () => {
  it('0.0624999999999 with 2.8e-11 reads 0.062500000000 ± 2.8e-11, concisely 0.062500000000(28)', () => {
    // Uncertainty to two significant digits, value rounded at the same place (common practice, as CODATA quotes its constants).
    expect(formatMeasurement(0.0624999999999, 2.8e-11)).toBe('0.062500000000 ± 2.8e-11');
    expect(formatConcise(0.0624999999999, 2.8e-11)).toBe('0.062500000000(28)');
    expect(formatValueAt(0.0624999999999, 2.8e-11)).toBe('0.062500000000');
  });

  it('reproduces the published concise forms of CODATA 2018 constants', () => {
    // CODATA 2018 recommended values (from memory): fine-structure constant 7.2973525693(11)e-3,
    // electron mass 9.1093837015(28)e-31 kg, Newtonian constant 6.67430(15)e-11, Rydberg constant 10973731.568160(21) 1/m.
    expect(formatConcise(7.2973525693e-3, 1.1e-12)).toBe('0.0072973525693(11)'); // written out above 1e-4
    expect(formatConcise(9.1093837015e-31, 2.8e-40)).toBe('9.1093837015(28)e-31');
    expect(formatConcise(6.6743e-11, 1.5e-15)).toBe('6.67430(15)e-11');
    expect(formatConcise(10973731.56816, 2.1e-5)).toBe('10973731.568160(21)');
  });

  it('rounds the uncertainty up to two digits, the value with it, and never writes digits a double does not hold', () => {
    expect(formatMeasurement(1.23456789, 0.000996)).toBe('1.2346 ± 1.0e-3');
    expect(formatMeasurement(-0.5000000001234, 3.3e-9)).toBe('-0.5000000001 ± 3.3e-9');
    expect(formatMeasurement(12345.678, 234)).toBe('12350 ± 2.3e+2');
    expect(formatMeasurement(0.003, 0.2)).toBe('0.00 ± 2.0e-1');
    expect(formatMeasurement(-0.0004, 0.2)).toBe('0.00 ± 2.0e-1');
    expect(formatMeasurement(0, 1e-12)).toBe('0 ± 1.0e-12');
    expect(formatMeasurement(0.0625, 1e-19)).toBe('0.0625 ± 1.0e-19');
    expect(formatMeasurement(1.2345678e-8, 2.1e-12)).toBe('1.23457e-8 ± 2.1e-12');
  });

  it('without a usable uncertainty the value keeps its significant digits', () => {
    expect(formatMeasurement(0.0625, null)).toBe('0.0625');
    expect(formatMeasurement(1 / 3, 0)).toBe('0.333333333333 ± 0.0e+0');
    expect(formatMeasurement(1 / 3, Number.NaN)).toBe('0.333333333333 ± NaN');
    expect(formatValueAt(1 / 3, null)).toBe('0.333333333333');
    expect(formatNumber(1 / 3)).toBe('0.3333333333');
    expect(formatNumber(1e-7)).toBe('1e-7');
    expect(formatUncertainty(2.84e-11)).toBe('2.8e-11');
  });
});

describe('exponents in messages are raised whole', () => {
  it('"the residual scales as eps^3.01" raises 3.01, not 3 followed by .01', () => {
    expect(messageParts('the residual scales as eps^3.01, expected eps^3')).toEqual([
      { text: 'the residual scales as eps', exponent: false },
      { text: '3.01', exponent: true, around: ['^', ''] },
      { text: ', expected eps', exponent: false },
      { text: '3', exponent: true, around: ['^', ''] },
    ]);
  });

  it('raises signed numbers, names and groups, and leaves a full stop after a number in the text', () => {
    const raised = (message: string) => messageParts(message).filter((p) => p.exponent).map((p) => p.text);
    expect(raised('falls like x^-1.5 and x^k, O(x^(k+1)) and t^{0.25}.')).toEqual(['-1.5', 'k', 'k+1', '0.25']);
    expect(messageParts('the difference is O(x^2).')).toEqual([
      { text: 'the difference is O(x', exponent: false },
      { text: '2', exponent: true, around: ['^', ''] },
      { text: ').', exponent: false },
    ]);
    expect(raised('it grows like l^3. Then it stops')).toEqual(['3']);
    // Every character but the raised text is kept around it, so the message can be rebuilt exactly.
    for (const message of ['O(x^(k+1)) and t^{ 0.25 }', 'x^-1.5, eps^3.01.']) {
      expect(messageParts(message).map((p) => (p.exponent ? `${p.around![0]}${p.text}${p.around![1]}` : p.text)).join('')).toBe(message);
    }
    expect(messageParts('no exponent here: a ^ b')).toEqual([{ text: 'no exponent here: a ^ b', exponent: false }]);
  });
});

describe('verdict messages quote values as a physicist writes them', () => {
  it('the eps^1 coefficient of nu at n = 0 (1/16) reads with the digits its uncertainty supports', () => {
    // nu = 1/2 + eps/16 + 15 eps^2/512 at n = 0: REFERENCES.md, O(n) exponents at n = 0 (from memory).
    const result = one(onFlow(0, 0.1), { kind: 'epsilon-coefficient', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '1/16' });
    expect(result.status).toBe('holds');
    const quoted = /is (-?[\d.]+(?:e-?\d+)?) ± (\d\.\de[-+]\d+)/.exec(result.message);
    expect(quoted, result.message).not.toBeNull();
    const [, value, uncertainty] = quoted!;
    // The last digit of the value sits where the uncertainty's second digit does.
    expect(lastPlace(value!)).toBe(Number(uncertainty!.split('e')[1]) - 1);
    expect(Math.abs(Number(value) - 1 / 16)).toBeLessThanOrEqual(Number(uncertainty));
    expect(result.message).not.toMatch(/9999/);
  });
});
