import { describe, expect, it } from 'vitest';
import { toJsonValue } from '../toJsonValue';

describe('toJsonValue', () => {
  it('turns typed arrays into plain arrays, nested at any depth', () => {
    expect(toJsonValue({ spectrum: { wavelengthNm: Float64Array.of(400, 402), hits: Int32Array.of(1) } })).toEqual({ spectrum: { wavelengthNm: [400, 402], hits: [1] } });
  });

  it('writes NaN and infinities as null and leaves out undefined keys', () => {
    expect(toJsonValue({ a: Number.NaN, b: [1, Number.POSITIVE_INFINITY], c: undefined, d: null, e: 'x', f: true })).toEqual({ a: null, b: [1, null], d: null, e: 'x', f: true });
    expect(toJsonValue(Float64Array.of(Number.NaN, 2))).toEqual([null, 2]);
  });

  it('gives a value JSON round-trips unchanged', () => {
    const v = toJsonValue({ layers: [{ x: 1.5, when: new Date('2026-11-03T00:00:00Z') }] });
    expect(JSON.parse(JSON.stringify(v))).toEqual(v);
    expect(v).toEqual({ layers: [{ x: 1.5, when: '2026-11-03T00:00:00.000Z' }] });
  });
});
