import { monitorCurve, type Design } from '@/analysis/design';

export type ChipTrace = { chip: number; x: number[]; signal: number[]; boundaries: { x: number; layer: number }[]; layers: number[] };

/**
 * The expected monitor signal of every layer on one witness chip, one after another, against
 * deposited thickness (nm, summed over the chip's layers) or time (s, each material at its rate).
 */
export function chipTrace(design: Design, chip: number, axis: 'thickness' | 'time', ratesNmPerS: Record<string, number>, pointsPerLayer = 160): ChipTrace {
  const layers = design.layers.filter((l) => l.monitor.chip === chip);
  const x: number[] = [];
  const signal: number[] = [];
  const boundaries: ChipTrace['boundaries'] = [];
  let start = 0;
  for (const layer of layers) {
    const scale = axis === 'time' ? 1 / (ratesNmPerS[layer.material] ?? 0.5) : 1;
    const grid = new Float64Array(pointsPerLayer);
    for (let i = 0; i < pointsPerLayer; i++) grid[i] = (layer.thicknessNm * i) / (pointsPerLayer - 1);
    const y = monitorCurve(design, layer.layer, grid);
    for (let i = 0; i < pointsPerLayer; i++) {
      x.push(start + grid[i] * scale);
      signal.push(y[i]);
    }
    start += layer.thicknessNm * scale;
    boundaries.push({ x: start, layer: layer.layer });
  }
  return { chip, x, signal, boundaries, layers: layers.map((l) => l.layer) };
}
