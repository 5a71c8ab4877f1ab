import { describe, expect, it } from 'vitest';
import { readTraceText } from '../readTrace';
import { segmentTrace } from '../segment';
import { autoSegment } from '../autoSegment';
import { gaussian } from './rng';

async function traceOf(layers: number[], chips?: number[]) {
  const head = chips ? 'time_s,signal,layer,chip' : 'time_s,signal,layer';
  const body = layers.map((l, i) => `${i},${0.5 + 0.01 * i},${l}${chips ? `,${chips[i]}` : ''}`).join('\n');
  return readTraceText(`${head}\n${body}\n`, { minLayerSamples: 1 });
}

describe('segmentTrace with a layer column', () => {
  it('gives one segment per contiguous run, idle runs apart, and warns about a paused layer', async () => {
    const s = segmentTrace(await traceOf([0, 0, 1, 1, 1, 0, 2, 2, 0, 2, 3]));
    expect(s.inferred).toBe(false);
    expect(s.layers.map((g) => [g.layer, g.run, g.startIndex, g.endIndex, g.sampleCount])).toEqual([
      [1, 1, 2, 5, 3],
      [2, 1, 6, 8, 2],
      [2, 2, 9, 10, 1],
      [3, 1, 10, 11, 1],
    ]);
    expect(s.idle.map((g) => [g.startIndex, g.endIndex])).toEqual([[0, 2], [5, 6], [8, 9]]);
    expect(s.layers[0]).toMatchObject({ startTimeS: 2, endTimeS: 4, chip: 1 });
    expect(s.warnings).toEqual([
      { code: 'layer_paused', layer: 2, line: 11, message: 'line 11: layer 2 resumes after a pause (run 2; kept as a separate segment)' },
    ]);
  });

  it('takes chips from the chip column, idle stretches included, and warns about a chip change inside a layer', async () => {
    const s = segmentTrace(await traceOf([0, 1, 1, 0, 0, 2, 2, 2], [1, 1, 1, 2, 2, 2, 3, 3]));
    expect(s.layers.map((g) => [g.layer, g.chip, g.startIndex])).toEqual([[1, 1, 1], [2, 2, 5], [2, 3, 6]]);
    expect(s.idle.map((g) => [g.chip, g.startIndex, g.endIndex])).toEqual([[1, 0, 1], [2, 3, 5]]);
    expect(s.warnings.map((w) => w.message)).toEqual(['line 8: the chip changes to 3 in the middle of layer 2']);
  });

  it('without a chip column uses chipOfLayer, and an idle stretch belongs to the chip of the layer after it', async () => {
    const s = segmentTrace(await traceOf([0, 1, 1, 0, 2, 0, 0, 3, 3, 0]), { chipOfLayer: (l) => (l >= 3 ? 2 : 1) });
    expect(s.layers.map((g) => g.chip)).toEqual([1, 1, 2]);
    expect(s.idle.map((g) => [g.startIndex, g.chip])).toEqual([[0, 1], [3, 1], [5, 2], [9, 2]]);
  });

  it('warns about layers out of order and a trace without any layer', async () => {
    expect(segmentTrace(await traceOf([0, 2, 2, 1, 1])).warnings).toEqual([
      { code: 'layer_order', layer: 1, line: 5, message: 'line 5: layer 1 follows layer 2 (layers out of order)' },
    ]);
    const none = segmentTrace(await traceOf([0, 0, 0]));
    expect(none.layers).toEqual([]);
    expect(none.warnings.map((w) => w.code)).toEqual(['no_layers']);
  });
});

/** Idle (flat) and deposition (fringe) stretches with known boundaries, 10 samples/s, 0.1 % noise. */
function synthetic(plan: { idle: number; layer: number; periodS: number }[], tailIdle: number, seed: number) {
  const g = gaussian(seed);
  const t: number[] = [];
  const y: number[] = [];
  const bounds: [number, number][] = [];
  let level = 0.9;
  const push = (v: number) => {
    t.push(t.length * 0.1);
    y.push(v + 0.0009 * g());
  };
  for (const { idle, layer, periodS } of plan) {
    for (let i = 0; i < idle; i++) push(level);
    const start = t.length;
    const base = level;
    for (let i = 1; i <= layer; i++) {
      level = base - 0.15 * (1 - Math.cos((2 * Math.PI * i * 0.1) / periodS)) + 0.0002 * i * 0.1;
      push(level);
    }
    bounds.push([start, t.length]);
  }
  for (let i = 0; i < tailIdle; i++) push(level);
  return { t: Float64Array.from(t), y: Float64Array.from(y), bounds };
}

describe('autoSegment (no layer column)', () => {
  it('finds deposition stretches, keeps a layer whole across its turning points, and says the segments were inferred', () => {
    const { t, y, bounds } = synthetic(
      [
        { idle: 400, layer: 2300, periodS: 90 }, // passes two extrema
        { idle: 500, layer: 1700, periodS: 130 },
        { idle: 300, layer: 900, periodS: 200 },
      ],
      400,
      21,
    );
    const s = autoSegment(t, y);
    expect(s.inferred).toBe(true);
    expect(s.layers.map((g) => g.layer)).toEqual([1, 2, 3]);
    // each layer starts at a turning point (slope 0, as in a quarter-wave stack), where the
    // departure is gradual: within 3.5 s; layers end mid-slope or past a turning point: within 1 s
    s.layers.forEach((g, i) => {
      expect(Math.abs(g.startIndex - bounds[i][0]), `layer ${i + 1} start`).toBeLessThan(35);
      expect(Math.abs(g.endIndex - bounds[i][1]), `layer ${i + 1} end`).toBeLessThan(10);
    });
    expect(s.idle).toHaveLength(4);
    expect(s.idle[0].startIndex).toBe(0);
    expect(s.idle[3].endIndex).toBe(t.length);
    expect(s.warnings).toEqual([
      {
        code: 'segments_inferred',
        message: 'the trace has no layer column: 3 deposition segments were inferred from the signal (changing vs. flat); check them against the design',
      },
    ]);
  });

  it('a step in an idle stretch (a chip change to a new bare chip) is not a layer', () => {
    const { t, y, bounds } = synthetic([{ idle: 400, layer: 1500, periodS: 100 }, { idle: 800, layer: 1500, periodS: 100 }], 300, 8);
    const jumpAt = bounds[0][1] + 400;
    for (let i = jumpAt; i < y.length; i++) y[i] += 0.05;
    const s = autoSegment(t, y);
    expect(s.layers).toHaveLength(2);
    expect(s.layers.map((g) => g.startIndex).map((v, i) => Math.abs(v - bounds[i][0]) < 35)).toEqual([true, true]);
  });

  it('segmentTrace falls back to it and numbers chips with chipOfLayer', async () => {
    const { t, y } = synthetic([{ idle: 400, layer: 1500, periodS: 100 }, { idle: 400, layer: 1500, periodS: 100 }], 300, 5);
    const text = `time_s,signal\n${Array.from(t, (v, i) => `${v.toFixed(1)},${y[i].toFixed(6)}`).join('\n')}\n`;
    const s = segmentTrace(await readTraceText(text), { chipOfLayer: (l) => l });
    expect(s.inferred).toBe(true);
    expect(s.layers.map((g) => [g.layer, g.chip])).toEqual([[1, 1], [2, 2]]);
    expect(s.idle.map((g) => g.chip)).toEqual([1, 2, 2]);
    expect(s.warnings[0].code).toBe('segments_inferred');
  });

  it('a flat trace has no layers; a single sample and an empty trace are idle or nothing', () => {
    const g = gaussian(2);
    const t = Float64Array.from({ length: 2000 }, (_, i) => i * 0.1);
    const flat = autoSegment(t, Float64Array.from(t, () => 0.7 + 0.001 * g()));
    expect(flat.layers).toEqual([]);
    expect(flat.idle).toHaveLength(1);
    expect(autoSegment([0], [1]).idle).toHaveLength(1);
    expect(autoSegment([], []).idle).toEqual([]);
    expect(() => autoSegment([0, 1], [1])).toThrow(new RangeError('autoSegment: timeS has 2 samples but signal has 1'));
  });
});
