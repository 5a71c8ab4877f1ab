/**
 * Writes the demo traces of sample-traces/ (synthetic, deterministic seeds) and their truth files.
 * Run: npx tsx sample-traces/generate.ts
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parseDesign } from '../analysis/design';
import { synthesizeRun, traceCsv, type SynthOptions } from '../analysis/synth';

const here = import.meta.dirname;

interface Sample {
  file: string;
  design: string;
  about: string;
  options: SynthOptions;
}

const shop = (chamber: string, run: string, operator: string, shift: string, date: string, wl: number) => ({
  shop: 'Larkspur Optical Works',
  chamber,
  run,
  operator,
  shift,
  date,
  monitor_wavelength_nm: String(wl),
  synthetic: 'yes (sample-traces/generate.ts; see README.md)',
});

export const SAMPLES: Sample[] = [
  {
    file: 'bay1-ar1-run0412.csv',
    design: 'ar1-mgf2-crown.json',
    about: 'single MgF2 layer, clean: 0.1 % noise only',
    options: { seed: 412, gain: 0.83, defaultRateNmPerS: 0.8, sampleIntervalS: 0.1, meta: shop('Bay 1 e-beam', 'B1-0412', 'Ines Varga', 'early', '2026-11-03', 550) },
  },
  {
    file: 'bay1-ar1-run0413-overshoot.csv',
    design: 'ar1-mgf2-crown.json',
    about: 'single MgF2 layer cut 6 % late (overshoot), rate falling 8 % over the layer',
    options: { seed: 413, gain: 0.83, defaultRateNmPerS: 0.8, rateDriftFraction: -0.08, overshoot: { 1: 0.06 }, meta: shop('Bay 1 e-beam', 'B1-0413', 'Ines Varga', 'early', '2026-11-03', 550) },
  },
  {
    file: 'bay2-bb4-run0587.csv',
    design: 'bbar4-visible.json',
    about: 'four-layer AR, level cuts; dark samples (offset), crystal_nm column with tooling 1.06 (Ta2O5) and 0.97 (SiO2), Ta2O5 index 0.015 low',
    options: {
      seed: 587, gain: 1.94, offset: 0.004, darkS: 10, rateNmPerS: { H: 0.25, L: 0.6 }, indexOffset: { H: -0.015 },
      tooling: { H: 1.06, L: 0.97 }, meta: shop('Bay 2 IAD', 'B2-0587', 'Tomasz Quill', 'day', '2026-11-05', 520),
    },
  },
  {
    file: 'bay2-bb4-run0588-nolayer.csv',
    design: 'bbar4-visible.json',
    about: 'four-layer AR without layer or chip column: the analysis finds the layers itself',
    options: {
      seed: 588, gain: 1.94, rateNmPerS: { H: 0.25, L: 0.6 }, settleS: 45, bareChipS: 45, layerColumn: false, chipColumn: false,
      meta: shop('Bay 2 IAD', 'B2-0588', 'Tomasz Quill', 'day', '2026-11-05', 520),
    },
  },
  {
    file: 'bay3-hr17-run1120.csv',
    design: 'hr17-mirror-600.json',
    about: '17-layer mirror, chip change after layer 10; TiO2 index drifting −0.03 per hour, gain drifting −2 % per hour',
    options: {
      seed: 1120, gain: 1.0, sampleIntervalS: 0.2, rateNmPerS: { H: 0.2, L: 0.5 }, indexDriftPerHour: { H: -0.03 }, gainDriftPerHour: -0.02,
      meta: shop('Bay 3 sputter', 'B3-1120', 'Priya Oyelaran', 'night', '2026-11-09', 600),
    },
  },
  {
    file: 'bay3-hr17-run1121-spike.csv',
    design: 'hr17-mirror-600.json',
    about: '17-layer mirror, chip change; rate spike (×1.8 for 12 s) in layer 6, layer 12 cut 4 % late, rates rising 5 % per layer',
    options: {
      seed: 1121, gain: 1.0, sampleIntervalS: 0.2, rateNmPerS: { H: 0.2, L: 0.5 }, rateDriftFraction: 0.05, overshoot: { 12: 0.04 },
      rateSpikes: [{ layer: 6, atFraction: 0.4, durationS: 12, factor: 1.8 }],
      meta: shop('Bay 3 sputter', 'B3-1121', 'Priya Oyelaran', 'night', '2026-11-10', 600),
    },
  },
];

export function generateSample(sample: Sample) {
  const file = path.join(here, sample.design);
  const design = parseDesign(JSON.parse(readFileSync(file, 'utf8')), file);
  return synthesizeRun(design, sample.options);
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename)) {
  for (const sample of SAMPLES) {
    const run = generateSample(sample);
    const csv = traceCsv(run);
    writeFileSync(path.join(here, sample.file), csv);
    const truth = { trace: sample.file, design: sample.design, about: sample.about, options: sample.options, layers: run.truth };
    writeFileSync(path.join(here, sample.file.replace(/\.csv$/, '.truth.json')), `${JSON.stringify(truth, null, 2)}\n`);
    console.log(`${sample.file}: ${run.timeS.length} rows, ${(csv.length / 1e6).toFixed(2)} MB`);
  }
}
