import { designSpectrum } from '../../analysis/design/designSpectrum';
import { type Design } from '../../analysis/design/parseDesign';
import { SHOP_DEFAULT_TOLERANCE } from '../../analysis/design/tolerance';
import { fromNK } from '../../analysis/optics/complex';
import { growingLayerSignal } from '../../analysis/optics/growingLayer';
import { type LayerAt } from '../../analysis/optics/assembly';

function medianMs(runs: number, job: () => void): { median: number; min: number } {
  job(); // warm-up (JIT)
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = process.hrtime.bigint();
    job();
    times.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  times.sort((a, b) => a - b);
  return { median: times[Math.floor(times.length / 2)], min: times[0] };
}

function sixtyLayerDesign(): Design {
  const layers = Array.from({ length: 60 }, (_, i) => ({
    layer: i + 1,
    material: i % 2 ? 'L' : 'H',
    thicknessNm: (i % 2 ? 550 / (4 * 1.46) : 550 / (4 * 2.3)) * (1 + 0.1 * Math.sin(i)),
    qwot: 1,
    monitor: { wavelengthNm: 550, mode: 'T' as const, chip: 1 + Math.floor(i / 10), cut: 'turning-point' as const },
    tolerance: SHOP_DEFAULT_TOLERANCE,
  }));
  return {
    name: 'bench 60 layers',
    referenceWavelengthNm: 550,
    ambient: { model: 'constant', n: 1 },
    substrate: { model: 'constant', n: 1.52 },
    substrateBackside: true,
    materials: {
      H: { model: 'cauchy', A: 2.2, B: 0.025, C: 0.0045, k: 0.0005 },
      L: { model: 'sellmeier', B: [0.6961663, 0.4079426, 0.8974794], C: [0.0684043, 0.1162414, 9.896161] },
    },
    layers,
  };
}

const line = (what: string, r: { median: number; min: number }, target?: number) =>
  console.log(
    `  ${what.padEnd(62)} median ${r.median.toFixed(2).padStart(7)} ms  (min ${r.min.toFixed(2)} ms${target === undefined ? '' : `; issue 3 target < ${target} ms`})`,
  );

/** Prints the optics figures of issue 3. */
export async function run(): Promise<void> {
  console.log('optics');
  const design = sixtyLayerDesign();
  line('spectrum, 60 layers, 2001 wavelengths, normal incidence', medianMs(15, () => designSpectrum(design, { fromNm: 400, toNm: 800, stepNm: 0.2 })), 20);
  line('spectrum, 60 layers, 2001 wavelengths, 45°, mean of s and p', medianMs(15, () => designSpectrum(design, { fromNm: 400, toNm: 800, stepNm: 0.2, angleDeg: 45 })));

  const below: LayerAt[] = Array.from({ length: 59 }, (_, i) => ({ n: fromNK(i % 2 ? 1.46 : 2.3, i % 2 ? 0 : 0.0005), thicknessNm: 60 + i }));
  const thickness = Float64Array.from({ length: 1_000_000 }, (_, i) => i * 1e-4);
  const out = new Float64Array(thickness.length);
  const spec = { ambient: fromNK(1), substrate: fromNK(1.52), below, growing: fromNK(2.3, 0.0005), wavelengthNm: 550, mode: 'T' as const };
  line('monitor curve, 10^6 points, 59 layers below, T (normal, mean)', medianMs(9, () => growingLayerSignal(spec, thickness, out)), 50);
  line('monitor curve, 10^6 points, 59 layers below, T with backside', medianMs(9, () => growingLayerSignal({ ...spec, backside: true }, thickness, out)));
}
