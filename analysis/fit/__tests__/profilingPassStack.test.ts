import { createReadStream, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { parseDesign } from '../../design';
import { readTrace } from '../../trace';
import { findStartDelay } from '../analyzeRun';
import * as stack from '../stackUncertainty';

vi.mock('../stackUncertainty', async (original) => {
  const real = await original<typeof import('../stackUncertainty')>();
  return { ...real, carryStackUncertainty: vi.fn(real.carryStackUncertainty) };
});

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');

describe('the start delay\'s profiling pass carries the stack\'s σ only where something reads it', () => {
  it('none on the demo mirror (no thin layer, no growth read from a start, no wander); each layer\'s when a thin layer could read it', async () => {
    const designFile = path.join(samples, 'hr17-mirror-600.json'), traceFile = path.join(samples, 'bay3-hr17-run1120.csv');
    const json = JSON.parse(readFileSync(designFile, 'utf8'));
    const design = parseDesign(json, designFile);
    const trace = await readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
    const carry = vi.mocked(stack.carryStackUncertainty);
    expect((await findStartDelay(design, trace, { mode: 'refit' }))!.kept).toBe(true);
    expect(carry).not.toHaveBeenCalled();
    // the same run with the thin-layer threshold above every layer's QWOT: a held index could weigh the layers below by their σ
    await findStartDelay(design, trace, { mode: 'refit', thinLayerQwot: 5 });
    expect(carry.mock.calls.length).toBeGreaterThanOrEqual(design.layers.length - 1);
  });
});
