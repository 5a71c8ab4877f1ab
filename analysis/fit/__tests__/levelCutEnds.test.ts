import { describe, expect, it } from 'vitest';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';
import { chamberCsv, simulateChamberRun } from '@/tests/chamber';
import { bbarDesign } from '@/tests/chamber/scenarios';
import { segmentByDesign } from '../designSegments';
import { levelCutEnds } from '../levelCutEnds';
import { placeBoundaries } from '../placeBoundaries';

// Traces from the independent chamber simulator (tests/chamber), written without a layer column:
// a four-layer AR cut on level, 3 s pauses that show no flat stretch above the noise.
describe('level cuts placed where the readings reach and leave the cut level (no layer column)', () => {
  it('puts every end within 2 s of the truth and the next starts within 2.5 s, where the whole-layer fit alone is off by up to 40 s', async () => {
    const json = bbarDesign();
    const design = parseDesign(json);
    let worstPlaced = 0;
    for (const seed of [93, 94, 95, 97]) {
      const run = simulateChamberRun(json, { seed, rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.001, columns: { layer: false } });
      const trace = await readTraceText(chamberCsv(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
      const seg = segmentByDesign(trace, design);
      const placed = placeBoundaries(trace, design, seg.layers, seg.windows);
      const ended = levelCutEnds(trace, design, placed, seg.gain);
      expect(ended.map((s) => s.layer)).toEqual([1, 2, 3, 4]);
      ended.forEach((s, i) => {
        const truth = run.truth.layers[i];
        worstPlaced = Math.max(worstPlaced, Math.abs(placed[i].endTimeS - truth.endTimeS));
        expect(Math.abs(s.endTimeS - truth.endTimeS)).toBeLessThan(2);
        if (i > 0) expect(Math.abs(s.startTimeS - truth.startTimeS)).toBeLessThan(2.5);
        expect(s.sampleCount).toBe(s.endIndex - s.startIndex);
      });
    }
    // what the readings around the cut add: the whole-layer placement misses some ends by far more
    expect(worstPlaced).toBeGreaterThan(10);
  });

  it('leaves turning-point cuts as placed', async () => {
    const json = bbarDesign();
    const design = parseDesign(json);
    const run = simulateChamberRun(json, { seed: 92, rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.001, columns: { layer: false } });
    const trace = await readTraceText(chamberCsv(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
    const seg = segmentByDesign(trace, design);
    const placed = placeBoundaries(trace, design, seg.layers, seg.windows);
    const tp = parseDesign({ ...json, layers: json.layers.map((l) => ({ ...l, monitor: { ...l.monitor, cut: 'turning-point' as const } })) });
    expect(levelCutEnds(trace, tp, placed, seg.gain)).toEqual(placed);
  });
});
