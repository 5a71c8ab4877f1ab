import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { listRuns } from '@/db/queries/runs';
import { latestAnalyses } from '@/db/queries/analyses';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { LayerTable } from '@/components/runs/LayerTable';
import { driftRows, layerRows } from '@/app/(app)/runs/[runId]/runView';
import { roles } from '@/db/schema';
import { capabilities } from '@/app/_lib/capabilities';
import RunsPage from '@/app/(app)/runs/(list)/page';
import RunLayout from '@/app/(app)/runs/[runId]/layout';
import RunPage from '@/app/(app)/runs/[runId]/page';
import { anonymous, interruptOf, signInDemo, textOf } from './helpers';

afterAll(async () => {
  await closeDb();
});

/** Every prop value in an element tree, as text (what a client component is handed). */
function propsText(node: unknown): string {
  if (node === null || typeof node !== 'object') return typeof node === 'string' ? node : '';
  if (Array.isArray(node)) return node.map(propsText).join(' ');
  const props = (node as { props?: Record<string, unknown> }).props;
  if (!props) return '';
  return Object.entries(props)
    .map(([k, v]) => (k === 'children' ? propsText(v) : JSON.stringify(v)))
    .join(' ');
}

const runPage = (runId: string, mode?: string) => RunPage({ params: Promise.resolve({ runId }), searchParams: Promise.resolve(mode ? { mode } : {}) });

async function demoRunId(code: string): Promise<string> {
  const run = (await listRuns()).find((r) => r.runCode === code);
  if (!run) throw new Error(`no demo run ${code}`);
  return String(run.id);
}

describe('the runs pages', () => {
  it('are open to every role', () => {
    expect(roles.filter((r) => capabilities[r].viewRuns)).toEqual(roles);
  });

  it('send signed-out visitors to sign-in', async () => {
    const id = await demoRunId('B1-0412');
    anonymous();
    expect(await interruptOf(() => RunsPage({}))).toEqual({ kind: 'redirect', location: '/sign-in' });
    expect(await interruptOf(() => runPage(id))).toEqual({ kind: 'redirect', location: '/sign-in' });
  });

  for (const role of roles) {
    it(`show the list and a run to the ${role}`, async () => {
      const id = await demoRunId('B2-0587');
      await signInDemo(role);
      // The list is a client component fed by the page: its rows are in the props the page passes.
      const list = propsText(await RunsPage({}));
      for (const code of ['B1-0412', 'B1-0413', 'B2-0587', 'B2-0588', 'B3-1120', 'B3-1121', 'B3-1122']) expect(list).toContain(code);
      expect(list).toContain('Bay 3 sputter');
      const run = textOf(await runPage(id));
      expect(run).toContain('Run B2-0587');
      expect(run).toContain("Fringelog's figures are advisory; cut and disposition decisions follow your shop's procedures.");
      expect(run).toContain('Tomasz Quill');
      expect(run).toContain('Joint re-fit');
      expect(run).toContain('Layer by layer');
    });
  }

  it('switch between the stored modes by the mode parameter', async () => {
    const id = await demoRunId('B2-0587');
    await signInDemo('operator');
    const refit = textOf(await runPage(id, 'refit'));
    const sequential = textOf(await runPage(id, 'sequential'));
    expect(refit).toContain('every layer of the chip re-estimated');
    expect(sequential).toContain('each layer fitted once');
    expect(textOf(await runPage(id, 'nonsense'))).toContain('every layer of the chip re-estimated');
  });

  it('show when each layer was cut against when it should have been', async () => {
    const id = await demoRunId('B1-0413');
    await signInDemo('operator');
    const refit = (await latestAnalyses(Number(id))).refit;
    const layer = refit?.layers[0];
    if (!layer) throw new Error('no refit analysis of B1-0413');
    const cut = Number(layer.detail.cutTimeS);
    const ideal = Number(layer.detail.idealCutTimeS);
    // the overshoot run: cut after the ideal moment (sample-traces/README.md)
    expect(cut).toBeGreaterThan(ideal);
    const rows = layerRows(refit);
    expect(rows[0]).toMatchObject({ cutTimeS: cut, idealCutTimeS: ideal });
    expect(rows[0].cutDeltaS).toBeCloseTo(cut - ideal, 9);
    // one Δt in seconds, not two absolute times
    const html = renderToStaticMarkup(createElement(LayerTable, { layers: rows }));
    expect(html).toContain(`${(cut - ideal).toFixed(1)} s late`);
  });

  it("give the index plot each fitted layer's own reading and σ (the drift's, not the pooled index's)", async () => {
    await signInDemo('engineer');
    const refit = (await latestAnalyses(Number(await demoRunId('B3-1120')))).refit;
    if (!refit) throw new Error('no refit analysis of B3-1120');
    const drift = driftRows(refit);
    const stored = (refit.analysis.summary as { indexDrift: { material: string; deviation: number[]; sigma: number[] }[] }).indexDrift;
    expect(drift.map((d) => d.material).sort()).toEqual(['H', 'L']);
    for (const d of drift) {
      const own = stored.find((s) => s.material === d.material)!;
      expect(d.sigma).toEqual(own.sigma);
      expect(d.deviation).toEqual(own.deviation);
      d.layers.forEach((layer, i) => {
        // the layer table's index is read with its material's trend (fit/pooledIndex.ts): the
        // same layer's own reading, drawn toward the trend by less than its own σ's few times
        const row = refit.layers.find((l) => l.layer === layer)!;
        expect(d.sigma[i]).toBeGreaterThan(0);
        expect(Math.abs(d.deviation[i] - (row.index - Number(row.detail.nominalIndex)))).toBeLessThan(3 * d.sigma[i]);
      });
    }
  });

  it('answer 404 for a run that does not exist or a malformed number', async () => {
    await signInDemo('engineer');
    for (const runId of ['999999999', '12abc', '0']) {
      expect(await interruptOf(() => RunLayout({ children: null, params: Promise.resolve({ runId }) })), runId).toEqual({ kind: 'http', status: 404 });
      expect(await interruptOf(() => runPage(runId)), runId).toEqual({ kind: 'http', status: 404 });
    }
    const known = await demoRunId('B1-0412');
    expect(await interruptOf(() => RunLayout({ children: null, params: Promise.resolve({ runId: known }) }))).toBe('returned');
  });
});
