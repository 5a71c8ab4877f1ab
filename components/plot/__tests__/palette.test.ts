import { describe, expect, it } from 'vitest';
import { stepTicks, wholeTicks } from '../palette';

describe('tick labels', () => {
  it('carry as many decimals as the step needs, so neighbouring ticks never read alike', () => {
    // uPlot's own labels round to three decimals: 0.0005 and 0.001 both read "0.001"
    expect(stepTicks(null, [0, 0.0005, 0.001, 0.0015], 1, 0, 0.0005)).toEqual(['0', '0.0005', '0.0010', '0.0015']);
    expect(stepTicks(null, [-0.02, -0.01, 0, 0.01], 1, 0, 0.01)).toEqual(['-0.02', '-0.01', '0', '0.01']);
    expect(stepTicks(null, [0, 0.5, 1, 1.5], 1, 0, 0.5)).toEqual(['0', '0.5', '1.0', '1.5']);
    expect(stepTicks(null, [0, 20, 40], 1, 0, 20)).toEqual(['0', '20', '40']);
  });

  it('leave half-steps unlabelled on whole-number axes', () => {
    expect(wholeTicks(null, [0.5, 1, 1.5, 2])).toEqual(['', '1', '', '2']);
  });
});
