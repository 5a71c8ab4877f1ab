// Diagnosis (run by hand): the no-layer-column demo trace's boundaries as segmentByDesign →
// placeBoundaries → levelCutEnds place them, with bend 0 and the default, against its truth file.
import { readFileSync } from 'node:fs';
import { parseDesign } from '@/analysis/design';
import { segmentByDesign } from '@/analysis/fit/designSegments';
import { levelCutEnds } from '@/analysis/fit/levelCutEnds';
import { placeBoundaries } from '@/analysis/fit/placeBoundaries';
import { readTraceText } from '@/analysis/trace/readTrace';
async function main() {
  const name = process.argv[2] ?? 'bay2-bb4-run0588-nolayer';
  const truth = JSON.parse(readFileSync(`sample-traces/${name}.truth.json`, 'utf8'));
  const design = parseDesign(JSON.parse(readFileSync(`sample-traces/${truth.design}`, 'utf8')), truth.design);
  const trace = await readTraceText(readFileSync(`sample-traces/${truth.trace}`, 'utf8'), { fileName: truth.trace, layerCount: design.layers.length });
  const by = segmentByDesign(trace, design);
  const placed = placeBoundaries(trace, design, by.layers, by.windows);
  for (const bend of [0, 2]) {
    const ended = levelCutEnds(trace, design, placed, by.gain, { bend });
    console.log(`bend ${bend}`);
    for (const tr of truth.layers) {
      const s = ended.find((x) => x.layer === tr.layer)!;
      const p = placed.find((x) => x.layer === tr.layer)!;
      console.log(`  L${tr.layer} start ${(s.startTimeS - tr.startTimeS).toFixed(2)} end ${(s.endTimeS - tr.endTimeS).toFixed(2)}   (placed ${(p.startTimeS - tr.startTimeS).toFixed(2)} ${(p.endTimeS - tr.endTimeS).toFixed(2)})`);
    }
  }
}
main().catch((e) => { console.error(e); process.exit(1); });
