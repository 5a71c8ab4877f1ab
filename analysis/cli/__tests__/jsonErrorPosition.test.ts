import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonErrorPosition, lineColumn } from '../jsonErrorPosition';

describe('jsonErrorPosition', () => {
  it('finds the offending character where JSON.parse gives no position', () => {
    expect(jsonErrorPosition('{"a": x}')).toBe(6);
    expect(jsonErrorPosition('{"a": tru}')).toBe(9);
    expect(jsonErrorPosition('')).toBe(0);
    expect(jsonErrorPosition('{"a": [1, 2]}')).toBe(-1);
  });

  it('agrees with JSON.parse on validity and, where V8 reports one, on the position (property test)', () => {
    fc.assert(
      fc.property(fc.json(), fc.nat(), fc.constantFrom('x', '}', ',', ':', '"', ' ', '1', ']', '\n', '\\'), (json, at, ch) => {
        const i = at % (json.length + 1);
        const text = json.slice(0, i) + ch + json.slice(i + 1);
        let v8: string | null = null;
        try {
          JSON.parse(text);
        } catch (e) {
          v8 = (e as Error).message;
        }
        const mine = jsonErrorPosition(text);
        expect(mine === -1).toBe(v8 === null);
        const m = v8 && /at position (\d+)/.exec(v8);
        if (m) expect(mine).toBe(Number(m[1]));
      }),
      { numRuns: 3000 },
    );
  });

  it('lineColumn counts from 1', () => {
    expect(lineColumn('ab\ncd', 0)).toEqual({ line: 1, column: 1 });
    expect(lineColumn('ab\ncd', 4)).toEqual({ line: 2, column: 2 });
  });
});
