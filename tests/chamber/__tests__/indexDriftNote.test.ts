import { describe, expect, it } from 'vitest';
import { analyzeRun, type AnalysisMode } from '@/analysis/fit';
import { parseDesign } from '@/analysis/design';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// The run's index drift (its table and the index plot's line) and the pooled-index note (the
// trend each material's indices are drawn toward, fit/pooledIndex.ts) say one thing: on a mirror
// cut on turning points every fitted layer is pooled, so both are the same layers' own readings,
// and the drift is the same random-effects weighted line (stats/indexDrift.ts). The simulator
// (tests/chamber, no code shared with analysis/) drifts the high-index film −0.01/h.
const NOTE = /^(\S+): the indices of its (\d+) turning-point layers read together \(option pooledIndex\): ([+−]\d\.\d{4}) from nominal at mid-run, drifting ([+−]\d\.\d{4})(?: ± (\d\.\d{4}))? per hour/;
const num = (s: string) => Number(s.replace('−', '-'));

describe("the run's index drift and its pooled-index note", () => {
  it('18-layer mirror, seeds 15–16, both modes: the same layers, mean, slope and slope σ (to the note\'s four places)', { timeout: 300_000 }, async () => {
    const scenario = scenarios().find((s) => s.name === 'correlated noise and spikes, mirror')!;
    const design = parseDesign(scenario.design, 'mirror18.json');
    for (const seed of [15, 16]) {
      const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
      const trace = await readTrace(chamberCsvChunks(run), { fileName: `mirror18 ${seed}.csv`, layerCount: design.layers.length });
      for (const mode of ['sequential', 'refit'] as AnalysisMode[]) {
        const a = await analyzeRun(design, trace, { mode });
        const notes = a.warnings.flatMap((w) => {
          const m = NOTE.exec(w);
          return m ? [{ material: m[1], count: Number(m[2]), atMean: num(m[3]), slope: num(m[4]), slopeSigma: m[5] === undefined ? null : num(m[5]) }] : [];
        });
        expect(notes.map((n) => n.material).sort(), `${mode} ${seed}`).toEqual(['H', 'L']);
        for (const n of notes) {
          const d = a.indexDrift.find((x) => x.material === n.material)!;
          const what = `${mode} seed ${seed} ${n.material}`;
          expect(d.layers.length, what).toBe(n.count);
          // the note rounds to 4 places: half a unit of the last, and a little for the rounding itself
          expect(Math.abs(d.byTime.slope - n.slope), `${what} slope ${d.byTime.slope} against the note's ${n.slope}`).toBeLessThanOrEqual(0.00005 + 1e-12);
          expect(Math.abs(d.meanDeviation - n.atMean), `${what} mean`).toBeLessThanOrEqual(0.00005 + 1e-12);
          expect(n.slopeSigma, what).not.toBeNull();
          expect(Math.abs(d.byTime.slopeSigma - n.slopeSigma!), `${what} slope σ`).toBeLessThanOrEqual(0.00005 + 1e-12);
        }
      }
    }
  });

  it('each point\'s σ is the layer\'s own σ as reported (after the gain drift\'s share is swapped in), pooled or not', { timeout: 300_000 }, async () => {
    const scenario = scenarios().find((s) => s.name === 'correlated noise and spikes, mirror')!;
    const design = parseDesign(scenario.design, 'mirror18.json');
    const run = simulateChamberRun(scenario.design, { ...scenario.options, seed: 15 });
    const trace = await readTrace(chamberCsvChunks(run), { fileName: 'mirror18 15.csv', layerCount: design.layers.length });
    const alone = await analyzeRun(design, trace, { mode: 'sequential', pooledIndex: false });
    const pooled = await analyzeRun(design, trace, { mode: 'sequential' });
    for (const d of alone.indexDrift) {
      d.layers.forEach((layer, i) => {
        // with no pooling the layer table's index is its own reading: its σ is the one reported
        const row = alone.layers.find((l) => l.layer === layer)!;
        expect(d.sigma[i], `${d.material} layer ${layer}`).toBe(row.indexSigma);
        expect(d.deviation[i]).toBeCloseTo(row.index - row.nominalIndex, 12);
      });
      // and pooling the indices leaves the drift's own readings and σ as they were
      const p = pooled.indexDrift.find((x) => x.material === d.material)!;
      expect(p.sigma).toEqual(d.sigma);
      expect(p.deviation).toEqual(d.deviation);
    }
  });
});
