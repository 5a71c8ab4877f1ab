'use client';

import { useCallback, useEffect, useRef, useState } from 'react';
import type uPlot from 'uplot';

export type SeriesPayload = { timeS: number[]; signal: number[]; model: (number | null)[]; decimated: boolean };

/** Main plot data [time, measured, model] and the residual strip's [time, measured − model]. */
export function toPlotData(p: SeriesPayload): { main: uPlot.AlignedData; residual: uPlot.AlignedData } {
  const residual = p.signal.map((s, i) => (p.model[i] === null ? null : s - (p.model[i] as number)));
  return { main: [p.timeS, p.signal, p.model], residual: [p.timeS, residual] };
}

/**
 * The run's series from /api/runs/{id}/series: the whole-run overview once (unless the page
 * brought it along, saving a round trip before the first draw), then a window at
 * full resolution each time the view settles on a narrower stretch (latest request wins).
 */
export function useTraceSeries(runId: number, analysisId: number | null, initial: SeriesPayload | null = null) {
  const [overview, setOverview] = useState<SeriesPayload | null>(initial);
  const [error, setError] = useState<string | null>(null);
  const pending = useRef<AbortController | null>(null);
  const base = `/api/runs/${runId}/series${analysisId === null ? '' : `?analysis=${analysisId}`}`;

  useEffect(() => {
    if (initial) return;
    const ac = new AbortController();
    fetch(base, { signal: ac.signal })
      .then(async (r) => {
        const body = (await r.json()) as SeriesPayload & { error?: { message: string } };
        if (!r.ok) throw new Error(body.error?.message ?? `the series could not be loaded (${r.status})`);
        setOverview(body);
      })
      .catch((e: unknown) => {
        if (!ac.signal.aborted) setError(e instanceof Error ? e.message : String(e));
      });
    return () => ac.abort();
  }, [base, initial]);

  const fetchWindow = useCallback(
    async (fromS: number, toS: number): Promise<SeriesPayload | null> => {
      pending.current?.abort();
      const ac = new AbortController();
      pending.current = ac;
      const sep = base.includes('?') ? '&' : '?';
      try {
        const r = await fetch(`${base}${sep}from=${fromS}&to=${toS}`, { signal: ac.signal });
        if (!r.ok) return null;
        return (await r.json()) as SeriesPayload;
      } catch {
        return null;
      }
    },
    [base],
  );

  return { overview, error, fetchWindow };
}
