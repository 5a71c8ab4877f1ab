import { parseDesign, type Design } from '../../design';
import { synthesizeRun, traceCsv, type SynthOptions, type SynthRun } from '../../synth';
import { readTraceText, type TraceData } from '../../trace';

/** An 18-layer (HL)^9 quarter-wave mirror at 600 nm, TiO2/SiO2, a fresh chip every 6 layers (each starting on H). */
export function mirror18(): Design {
  const layers = Array.from({ length: 18 }, (_, i) => ({
    material: i % 2 === 0 ? 'H' : 'L',
    qwot: 1,
    monitor: { wavelengthNm: 600, mode: 'T', chip: 1 + Math.floor(i / 6), cut: 'turning-point' },
  }));
  return parseDesign({
    format: 'fringelog.design/1', name: 'test mirror (HL)^9', referenceWavelengthNm: 600, substrate: 'fused-silica',
    substrateBackside: true, materials: { H: 'TiO2', L: 'SiO2' }, layers,
  });
}

/** A four-layer broadband AR with non-quarter-wave layers cut on level (two thin ones). */
export function bbar4(): Design {
  const m = (thicknessNm: number, material: string) => ({ material, thicknessNm, monitor: { wavelengthNm: 520, mode: 'T', chip: 1, cut: 'level' } });
  return parseDesign({
    format: 'fringelog.design/1', name: 'test BBAR4', referenceWavelengthNm: 550, substrate: 'crown-glass-1.52', substrateBackside: true,
    materials: { H: 'Ta2O5', L: 'SiO2' }, layers: [m(13.5, 'H'), m(36, 'L'), m(119, 'H'), m(91.5, 'L')],
  });
}

export async function synthTrace(design: Design, options: SynthOptions): Promise<{ run: SynthRun; trace: TraceData }> {
  const run = synthesizeRun(design, options);
  const trace = await readTraceText(traceCsv(run), { fileName: 'synthetic.csv', layerCount: design.layers.length });
  return { run, trace };
}
