// Trace analysis figures for `npm run bench`: a 40-layer, 10⁶-sample synthetic run through
// parse (readTrace from CSV chunks), segmentation, the fit of every layer and the spectra.
// The fit uses at most 400 bin means per layer (bins equal in time) in its iterations and all
// samples for the residuals (AnalyzeOptions.maxFitPoints).
import { parseDesign } from '../../analysis/design';
import { analyzeRun } from '../../analysis/fit';
import { synthesizeRun, traceCsvChunks, type SynthOptions } from '../../analysis/synth';
import { readTrace } from '../../analysis/trace';

const LAYERS = 40;
const TARGET_SAMPLES = 1_000_000;

/** The design of the bench run: 40 layers, (HL)^20 at 600 nm, a fresh chip every 8 layers. */
export function design40Document() {
  const layers = Array.from({ length: LAYERS }, (_, i) => ({
    material: i % 2 === 0 ? 'H' : 'L',
    qwot: 1,
    monitor: { wavelengthNm: 600, mode: 'T', chip: 1 + Math.floor(i / 8), cut: 'turning-point' },
  }));
  return {
    format: 'fringelog.design/1', name: 'bench (HL)^20, a fresh chip every 8 layers', referenceWavelengthNm: 600,
    substrate: 'fused-silica', substrateBackside: true, materials: { H: 'TiO2', L: 'SiO2' }, layers,
  };
}

const design40 = () => parseDesign(design40Document());

/** The bench run's trace: about 10⁶ samples, with the synthesiser's truth. */
export function benchSynth(design = design40()) {
  const base: SynthOptions = { seed: 40, rateNmPerS: { H: 0.25, L: 0.5 }, rateDriftFraction: 0.03, indexDriftPerHour: { H: -0.02 } };
  // Idle stretches are rounded to whole samples, so size the interval from a coarse probe run.
  const probe = synthesizeRun(design, { ...base, sampleIntervalS: 0.1 });
  return synthesizeRun(design, { ...base, sampleIntervalS: (0.1 * probe.timeS.length) / (TARGET_SAMPLES * 1.01) });
}

const mb = (bytes: number) => `${(bytes / 2 ** 20).toFixed(0)} MB`;

export async function run(): Promise<void> {
  const design = design40();
  const synth = benchSynth(design);
  const chunks = Array.from(traceCsvChunks(synth, { rowsPerChunk: 50_000 }));
  const bytes = chunks.reduce((a, c) => a + c.length, 0);
  const rssBefore = process.memoryUsage().rss;

  let peakRss = rssBefore;
  const t0 = performance.now();
  const trace = await readTrace(chunks, { fileName: 'bench.csv', layerCount: LAYERS });
  const t1 = performance.now();
  peakRss = Math.max(peakRss, process.memoryUsage().rss);
  const result = await analyzeRun(design, trace, { mode: 'sequential', onProgress: () => (peakRss = Math.max(peakRss, process.memoryUsage().rss)) });
  const t2 = performance.now();
  const refit = await analyzeRun(design, trace, { mode: 'refit', onProgress: () => (peakRss = Math.max(peakRss, process.memoryUsage().rss)) });
  const t3 = performance.now();

  const worst = (r: typeof result) =>
    Math.max(...r.layers.map((l) => Math.abs(l.thicknessNm / synth.truth[l.layer - 1].thicknessNm - 1))) * 100;
  console.log(`analysis: ${LAYERS} layers, ${trace.rowCount.toLocaleString('en')} samples, ${mb(bytes)} of CSV`);
  console.log(`  parse (readTrace)                     ${(t1 - t0).toFixed(0)} ms`);
  console.log(`  segment + fit + spectra, sequential   ${(t2 - t1).toFixed(0)} ms   (parse + analysis ${(t2 - t0).toFixed(0)} ms; target < 2000, aim 1000)`);
  console.log(`  segment + fit + spectra, refit        ${(t3 - t2).toFixed(0)} ms`);
  console.log(`  worst thickness error: sequential ${worst(result).toFixed(2)} %, refit ${worst(refit).toFixed(2)} %`);
  console.log(`  memory: rss before parse ${mb(rssBefore)} (CSV chunks held), peak rss sampled ${mb(peakRss)}, process maxRSS ${mb(process.resourceUsage().maxRSS * 1024)}`);
}

if (process.argv[1]?.endsWith('analysis.ts')) await run();
