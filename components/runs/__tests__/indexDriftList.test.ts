import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { driftMethodNote, IndexDriftList, type DriftView } from '../IndexDriftList';

const drift = (over: Partial<DriftView>): DriftView => ({ material: 'H', layers: [1, 3, 5, 7, 9], meanDeviation: 0.0004, slopePerHour: -0.001, slopeSigmaPerHour: 0.0029, ...over });

describe('the index drift table', () => {
  it('says the trend is weighted as the pooled-index note is, and never calls it unweighted then', () => {
    const html = renderToStaticMarkup(createElement(IndexDriftList, { drift: [drift({ method: 'random-effects' }), drift({ material: 'L', method: 'random-effects' })] }));
    expect(html).toContain('−0.0010 ± 0.0029');
    expect(html).toContain('Offset at mid-run');
    expect(html).toContain('1/(σ² + τ²)');
    expect(html).not.toContain('unweighted');
  });

  it('an analysis stored before the drift was weighted (no method) says its line is unweighted', () => {
    expect(driftMethodNote([drift({})])).toMatch(/unweighted \(an analysis stored before the drift was weighted/);
    // materials drawn differently are named
    const mixed = driftMethodNote([drift({ method: 'random-effects' }), drift({ material: 'L', method: 'weighted' })]);
    expect(mixed).toMatch(/^Trend: .*H: each layer weighted by 1\/\(σ² \+ τ²\).*; L: fewer than five layers/);
    expect(driftMethodNote([])).toBe('');
  });
});
