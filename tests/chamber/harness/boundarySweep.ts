// A diagnosis, not a test (run by hand: WN=1e-5 npx tsx tests/chamber/harness/boundarySweep.ts):
// the level-cut BBAR without a layer column, seeds 31–46, each layer's start and end as
// segmentByDesign → placeBoundaries → levelCutEnds place them against the simulator's logged
// times (s), with the design's curves alone (bend 0) and with levelCutEnds' default. WN sets the
// white noise (the scenario's own by default); ROW the scenario (by default 'no layer column, BBAR
// level cuts'; 'no layer column, BBAR level cuts, correlated noise' has the demo B2-0588's noise).
import { parseDesign } from '@/analysis/design';
import { segmentByDesign } from '@/analysis/fit/designSegments';
import { levelCutEnds } from '@/analysis/fit/levelCutEnds';
import { placeBoundaries } from '@/analysis/fit/placeBoundaries';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';
async function main() {
  const sc = scenarios().find((s) => s.name === (process.env.ROW ?? 'no layer column, BBAR level cuts'))!;
  const wn = Number(process.env.WN ?? sc.options.whiteNoise ?? 0.001);
  for (const bend of [0, 2]) {
    const errE: number[][] = [[], [], [], []], errS: number[][] = [[], [], [], []];
    for (let seed = 31; seed <= 46; seed++) {
      const run = simulateChamberRun(sc.design, { ...sc.options, whiteNoise: wn, seed });
      const design = parseDesign(sc.design, 'x.json');
      const trace = await readTrace(chamberCsvChunks(run), { fileName: 'x.csv', layerCount: 4 });
      const by = segmentByDesign(trace, design);
      const placed = levelCutEnds(trace, design, placeBoundaries(trace, design, by.layers, by.windows), by.gain, { bend });
      for (const tr of run.truth.layers) {
        const s = placed.find((x) => x.layer === tr.layer)!;
        errE[tr.layer - 1].push(s.endTimeS - tr.endTimeS);
        errS[tr.layer - 1].push(s.startTimeS - tr.startTimeS);
      }
    }
    const st = (v: number[]) => `mean ${(v.reduce((a, b) => a + b, 0) / v.length).toFixed(2)} rms ${Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length).toFixed(2)} max ${Math.max(...v.map(Math.abs)).toFixed(2)}`;
    console.log(`bend ${bend} wn ${wn}`);
    for (let l = 0; l < 4; l++) console.log(`  L${l + 1} start ${st(errS[l])} | end ${st(errE[l])}`);
  }
}
main().catch((e) => { console.error(e); process.exit(1); });
