import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { ChipTable, offsetOrigin } from '../ChipsAndTooling';

describe('the chip table', () => {
  it('shows a fitted offset with its σ and where it came from', () => {
    const html = renderToStaticMarkup(createElement(ChipTable, {
      chips: [
        { chip: 1, gain: 0.93, offset: 0.0051, offsetSigma: 0.0004, offsetSource: 'fitted', noiseSigma: 0.0003, source: 'bare-chip' },
        { chip: 2, gain: 0.91, offset: 0.002, offsetSigma: 0, offsetSource: 'dark', noiseSigma: 0.0003, source: 'bare-chip' },
      ],
    }));
    expect(html).toContain('0.0051<span class="text-ink-faint"> ± 0.0004</span>');
    expect(html).toContain('fitted to the layers');
    // A σ of 0 (an offset read from dark samples with no spread given) shows no "±".
    expect(html.split('±')).toHaveLength(2);
    expect(html).toContain('dark readings');
  });

  it('names every offset source the analysis writes, and nothing for an unknown one', () => {
    for (const s of ['dark', 'fitted', 'averaged', 'earlier-chip', 'other-chips', 'assumed']) expect(offsetOrigin(s)).toBeTruthy();
    expect(offsetOrigin('something else')).toBeNull();
    expect(offsetOrigin(undefined)).toBeNull();
  });
});
