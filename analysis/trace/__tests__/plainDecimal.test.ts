import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { plainDecimal, scanDecimal, scanDecimalBytes, scanned } from '../plainDecimal';

// The reference is the engine's own Number() (ECMAScript StringToNumber, correctly rounded), an
// implementation independent of ours; a plain decimal must read bit for bit the same.
const reference = (s: string) => {
  const v = Number(s);
  return Number.isFinite(v) ? v : NaN;
};

describe('plainDecimal', () => {
  it('equals Number() bit for bit on any plain decimal (fast path and long mantissas alike)', () => {
    const digits = (max: number) => fc.array(fc.integer({ min: 0, max: 9 }), { maxLength: max }).map((d) => d.join(''));
    const text = fc
      .record({
        sign: fc.constantFrom('', '+', '-'),
        whole: digits(20),
        fraction: fc.option(digits(20)),
        exponent: fc.option(fc.record({ e: fc.constantFrom('e', 'E'), sign: fc.constantFrom('', '+', '-'), value: fc.integer({ min: 0, max: 400 }) })),
      })
      // a plain decimal has at least one mantissa digit (Number('') is 0, but an empty field is no number)
      .filter(({ whole, fraction }) => whole.length + (fraction ?? '').length > 0)
      .map(({ sign, whole, fraction, exponent }) => `${sign}${whole}${fraction === null ? '' : `.${fraction}`}${exponent === null ? '' : `${exponent.e}${exponent.sign}${exponent.value}`}`);
    fc.assert(
      fc.property(text, (s) => {
        expect(Object.is(plainDecimal(s, 0, s.length), reference(s))).toBe(true);
      }),
      { numRuns: 20000, seed: 7 },
    );
  });

  it('reads back any double from its shortest form (String(x)), −0 included', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const s = String(x);
        expect(Object.is(plainDecimal(s, 0, s.length), x === 0 && Object.is(x, -0) ? 0 : x)).toBe(true);
      }),
      { numRuns: 20000, seed: 8 },
    );
    expect(Object.is(plainDecimal('-0', 0, 2), -0)).toBe(true);
    expect(Object.is(plainDecimal('-0.000', 0, 6), -0)).toBe(true);
  });

  it('typical trace fields', () => {
    const cases: [string, number][] = [['0.936162', 0.936162], ['9682.370', 9682.37], ['-0.001', -0.001], ['40', 40], ['1.', 1], ['.5', 0.5], ['+2e-3', 0.002], ['1E+05', 100000]];
    for (const [s, v] of cases) expect(plainDecimal(s, 0, s.length)).toBe(v);
  });

  it('NaN for what is not a plain decimal, or not finite, so the caller takes the general path', () => {
    for (const s of ['', ' 1', '1 ', '0x10', '0b1', '.', '-', '+', 'e5', '1e', '1e+', 'Infinity', '-Infinity', 'NaN', '1,2', '1e5.5', '+-1', '1\r', '"1"', '1e400', '-1e999']) {
      expect(plainDecimal(s, 0, s.length)).toBeNaN();
    }
  });

  it('reads only text[start, end)', () => {
    expect(plainDecimal('xx12.5yy', 2, 6)).toBe(12.5);
    expect(plainDecimal('3,4', 0, 1)).toBe(3);
    expect(plainDecimal('3,4', 2, 3)).toBe(4);
  });

  it('scanDecimal reads a field up to its separator and says where it stopped', () => {
    const row = '12.5,-3e2,7';
    expect(scanDecimal(row, 0, row.length, 44)).toBe(12.5);
    expect(scanned.end).toBe(4);
    expect(scanDecimal(row, 5, row.length, 44)).toBe(-300);
    expect(scanned.end).toBe(9);
    expect(scanDecimal(row, 10, row.length, 44)).toBe(7);
    expect(scanned.end).toBe(11);
    expect(scanDecimal('1.5;2', 0, 5, 44)).toBeNaN();
    expect(scanDecimal('12345678901234567890,1', 0, 22, 44)).toBe(12345678901234567890);
    expect(scanned.end).toBe(20);
  });

  it('scanDecimalBytes reads ASCII bytes as scanDecimal reads the same text: value and stop', () => {
    const field = fc.stringMatching(/^[-+]?[0-9]{0,20}(\.[0-9]{0,20})?([eE][-+]?[0-9]{0,4})?[,;x]?[0-9]{0,3}$/);
    fc.assert(
      fc.property(field, fc.nat({ max: 3 }), (s, from) => {
        const start = Math.min(from, s.length);
        const bytes = new TextEncoder().encode(s);
        const a = scanDecimal(s, start, s.length, 44);
        const endA = scanned.end;
        scanned.end = -1;
        const b = scanDecimalBytes(bytes, start, bytes.length, 44);
        expect(Object.is(a, b)).toBe(true);
        if (a === a) expect(scanned.end).toBe(endA);
      }),
      { numRuns: 20000, seed: 9 },
    );
  });
});
