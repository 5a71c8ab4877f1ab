import { readFileSync } from 'node:fs';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { DataTable } from '../DataTable';
import { DesignLayersTable } from '../../designs/DesignLayersTable';
import { parseDesign } from '@/analysis/design';

describe('the list table', () => {
  it('scrolls sideways, aligns number columns right and keeps the rows it is given', () => {
    const html = renderToStaticMarkup(
      createElement(
        DataTable,
        {
          testId: 'things',
          gap: 'pr-3',
          columns: [
            { key: 'name', label: 'Name' },
            { key: 'n', label: 'n at 550 nm', right: true },
            { key: 'when', label: 'When', className: 'hidden sm:table-cell' },
          ],
        },
        createElement('tr', { 'data-row': 'a' }, createElement('td', null, 'MgF2')),
      ),
    );
    expect(html).toMatch(/^<div class="overflow-x-auto"><table class="w-full text-left text-sm" data-testid="things">/);
    expect(html).toContain('<th class="pb-2 pr-3 font-medium">Name</th>');
    expect(html).toContain('<th class="pb-2 pr-3 font-medium text-right">n at 550 nm</th>');
    expect(html).toContain('<th class="pb-2 pr-3 font-medium hidden sm:table-cell">When</th>');
    expect(html).toContain('<tbody class="divide-y divide-paper-line"><tr data-row="a"><td>MgF2</td></tr></tbody>');
  });

  it('gives a design table one heading for each cell of its rows', () => {
    // a demo design from sample-traces (four layers, each on its own row)
    const design = parseDesign(JSON.parse(readFileSync(new URL('../../../sample-traces/bbar4-visible.json', import.meta.url), 'utf8')), 'bbar4-visible.json');
    const html = renderToStaticMarkup(createElement(DesignLayersTable, { design }));
    const headings = html.match(/<th /g)?.length ?? 0;
    const first = html.indexOf('<tr data-layer="1"');
    const row = html.slice(first, html.indexOf('</tr>', first));
    expect(headings).toBe(9);
    expect(row.match(/<td /g)?.length).toBe(headings);
  });
});
