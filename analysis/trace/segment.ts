import { autoSegment, type AutoSegmentOptions } from './autoSegment';
import type { Segment, Segmentation, TraceData, TraceWarning } from './types';

export interface SegmentOptions {
  /** Chip of a layer when the trace has no chip column (e.g. from the design). @default () => 1 */
  chipOfLayer?: (layer: number) => number;
  /** Settings for the signal-based segmentation of a trace without a layer column. */
  auto?: AutoSegmentOptions;
}

/**
 * Splits a trace into deposition segments (one per contiguous run of a nonzero layer value,
 * also split where the chip changes) and idle segments (runs of layer 0). A layer that appears
 * in several separate runs (a paused layer) keeps one segment per run, numbered by `run`, with
 * a warning; they are not merged. Without a layer column the segments are inferred from the
 * signal by autoSegment, and a warning says so.
 */
export function segmentTrace(trace: TraceData, options: SegmentOptions = {}): Segmentation {
  const chipOfLayer = options.chipOfLayer ?? (() => 1);
  if (!trace.layer) {
    const auto = autoSegment(trace.timeS, trace.signal, options.auto);
    const chipAt = trace.chip;
    for (const seg of auto.layers) seg.chip = chipAt ? chipAt[seg.startIndex] : chipOfLayer(seg.layer);
    if (chipAt) for (const seg of auto.idle) seg.chip = chipAt[seg.startIndex];
    else assignIdleChips(auto.idle, auto.layers, chipOfLayer);
    return auto;
  }
  const { layer, chip, timeS, rowCount: n } = trace;
  const layers: Segment[] = [];
  const idle: Segment[] = [];
  const warnings: TraceWarning[] = [];
  const runs = new Map<number, number>();
  const lineOf = (i: number) => trace.headerLine + 1 + i;
  let lastLayer = 0;
  let start = 0;
  for (let i = 1; i <= n; i++) {
    const boundary = i === n || layer[i] !== layer[start] || (chip !== null && chip[i] !== chip[start]);
    if (!boundary) continue;
    const l = layer[start];
    const c = chip ? chip[start] : l > 0 ? chipOfLayer(l) : 0;
    const run = (runs.get(l) ?? 0) + 1;
    runs.set(l, run);
    const seg: Segment = { layer: l, chip: c, startIndex: start, endIndex: i, startTimeS: timeS[start], endTimeS: timeS[i - 1], sampleCount: i - start, run };
    if (l === 0) idle.push(seg);
    else {
      if (run > 1) {
        const sameChipSplit = chip !== null && layers.length > 0 && layers[layers.length - 1].layer === l && layers[layers.length - 1].endIndex === start;
        warnings.push(
          sameChipSplit
            ? { code: 'chip_change_in_layer', layer: l, line: lineOf(start), message: `line ${lineOf(start)}: the chip changes to ${c} in the middle of layer ${l}` }
            : { code: 'layer_paused', layer: l, line: lineOf(start), message: `line ${lineOf(start)}: layer ${l} resumes after a pause (run ${run}; kept as a separate segment)` },
        );
      }
      if (l < lastLayer) {
        warnings.push({ code: 'layer_order', layer: l, line: lineOf(start), message: `line ${lineOf(start)}: layer ${l} follows layer ${lastLayer} (layers out of order)` });
      }
      lastLayer = Math.max(lastLayer, l);
      layers.push(seg);
    }
    start = i;
  }
  if (!chip) assignIdleChips(idle, layers, chipOfLayer);
  if (layers.length === 0 && n > 0) {
    warnings.push({ code: 'no_layers', message: 'the layer column is 0 throughout: no deposition segments' });
  }
  return { layers, idle, warnings, inferred: false };
}

/**
 * Without a chip column an idle stretch takes the chip of the layer that follows it (so the
 * bare-chip stretch before a new chip's first layer calibrates that chip), else of the one before.
 */
function assignIdleChips(idle: Segment[], layers: Segment[], chipOfLayer: (layer: number) => number): void {
  let j = 0;
  for (const seg of idle) {
    while (j < layers.length && layers[j].startIndex < seg.endIndex) j++;
    seg.chip = j < layers.length ? layers[j].chip : j > 0 ? layers[j - 1].chip : chipOfLayer(1);
  }
}
