import { createReadStream, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { parseDesign } from '../../design';
import { readTrace } from '../../trace';
import { analyzeRun } from '../analyzeRun';
import * as noiseModel from '../idleNoiseModel';

vi.mock('../idleNoiseModel', async (original) => {
  const real = await original<typeof import('../idleNoiseModel')>();
  return { ...real, idleNoiseModel: vi.fn(real.idleNoiseModel) };
});

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');

describe('the start delay\'s profiling pass and the analysis read the trace\'s segmentation and idle noise once', () => {
  it('models the idle stretches\' noise once for both passes', async () => {
    const designFile = path.join(samples, 'hr17-mirror-600.json'), traceFile = path.join(samples, 'bay3-hr17-run1120.csv');
    const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);
    const trace = await readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    // two passes ran: the delay was profiled and kept
    expect(result.warnings.some((w) => w.startsWith('start transient:') && w.includes('every layer fitted with it'))).toBe(true);
    expect(vi.mocked(noiseModel.idleNoiseModel)).toHaveBeenCalledTimes(1);
  });
});
