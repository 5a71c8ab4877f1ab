import { describe, expect, it } from 'vitest';
import { AnalysisInputError, analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';
import { chamberCsv, simulateChamberRun, type ChamberRun } from '@/tests/chamber';
import { bbarDesign, mirrorDesign } from '@/tests/chamber/scenarios';
import { segmentByDesign } from '../designSegments';
import { placeBoundaries } from '../placeBoundaries';

// Traces from the independent chamber simulator (tests/chamber), written without a layer column.
const json = mirrorDesign(8, 4);
const design = parseDesign(json);
const options = { seed: 91, rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.0005, settleS: 20, columns: { layer: false, chip: false } };

async function read(run: ChamberRun) {
  return readTraceText(chamberCsv(run), { fileName: 'no-layer.csv', layerCount: design.layers.length });
}

function cut(run: ChamberRun, lastIndex: number): ChamberRun {
  return {
    ...run, timeS: run.timeS.slice(0, lastIndex), signal: run.signal.slice(0, lastIndex), fraction: run.fraction.slice(0, lastIndex),
    layer: run.layer.slice(0, lastIndex), chip: run.chip.slice(0, lastIndex), crystalNm: run.crystalNm?.slice(0, lastIndex) ?? null,
  };
}

describe('segmentation from the design (no layer column)', () => {
  it('gives every layer of a turning-point-cut mirror on two chips one segment, placed within 3 s of the truth', async () => {
    const run = simulateChamberRun(json, options);
    const trace = await read(run);
    expect(trace.layer).toBeNull();
    const seg = segmentByDesign(trace, design);
    expect(seg.missing).toEqual([]);
    expect(seg.layers.map((s) => s.layer)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    // chips from the design: the trace has no chip column
    expect(seg.layers.map((s) => s.chip)).toEqual([1, 1, 1, 1, 2, 2, 2, 2]);
    const placed = placeBoundaries(trace, design, seg.layers, seg.windows);
    placed.forEach((s, i) => {
      const truth = run.truth.layers[i];
      expect(Math.abs(s.startTimeS - truth.startTimeS)).toBeLessThan(3);
      expect(Math.abs(s.endTimeS - truth.endTimeS)).toBeLessThan(3);
    });
  });

  it('finds every level-cut layer, though its 3 s pauses do not show as flat (cut-level crossings), the thick last layer within 7 s', async () => {
    const bbarJson = bbarDesign();
    const bbar = parseDesign(bbarJson);
    for (const seed of [92, 93, 94, 95]) {
      const run = simulateChamberRun(bbarJson, { seed, rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.001, columns: { layer: false } });
      const trace = await readTraceText(chamberCsv(run), { fileName: 'bbar.csv', layerCount: bbar.layers.length });
      const seg = segmentByDesign(trace, bbar);
      expect(seg.missing).toEqual([]);
      const placed = placeBoundaries(trace, bbar, seg.layers, seg.windows);
      expect(placed.map((s) => s.layer)).toEqual([1, 2, 3, 4]);
      // the thin first layers' boundaries are off by up to ~50 s on these seeds (see the 'no layer column, BBAR' scenario)
      expect(Math.abs(placed[3].startTimeS - run.truth.layers[3].startTimeS)).toBeLessThan(7);
      expect(Math.abs(placed[3].endTimeS - run.truth.layers[3].endTimeS)).toBeLessThan(7);
    }
  });

  it('fails the analysis naming the layer the design expects but the trace lacks', async () => {
    const full = simulateChamberRun(json, options);
    const end = full.truth.layers[6].endTimeS + 15;
    const trace = await read(cut(full, full.timeS.findIndex((t) => t > end)));
    const error = await analyzeRun(design, trace).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AnalysisInputError);
    expect((error as AnalysisInputError).layers).toEqual([8]);
    expect((error as AnalysisInputError).message).toMatch(/layer 8 \(L\): no segment of the trace was found for it/);
  });

  it('two single rows that look paused inside a layer (the level of the pause before it): no crash, every layer found', async () => {
    const run = simulateChamberRun(json, options);
    const l3 = run.truth.layers[2];
    const mid = run.timeS.findIndex((t) => t > (l3.startTimeS + l3.endTimeS) / 2);
    const pauseLevel = run.signal[run.timeS.findIndex((t) => t > l3.startTimeS - 5)];
    run.signal[mid] = pauseLevel;
    run.signal[mid + 2] = pauseLevel;
    const result = await analyzeRun(design, await read(run), { mode: 'sequential' });
    expect(result.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(Math.abs(result.layers[2].thicknessNm / l3.thicknessNm - 1)).toBeLessThan(0.02);
  });
});
