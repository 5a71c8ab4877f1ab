'use client';

import Link from 'next/link';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { RunSummaryJson } from '@/app/_lib/api/json';
import { fetchJson } from '@/components/query/fetchJson';
import { AnalysisStateBadge } from './AnalysisStateBadge';
import { AttentionFlag } from './AttentionFlag';
import { fixed } from './format';
import { sortLabels, toQueryString, type RunsQuery } from './runsQuery';

export type RunsPage = { runs: RunSummaryJson[]; total: number; page: number; pageSize: number };
export type RunsOptions = { designs: string[]; chambers: string[] };

const inputClass = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 text-sm text-ink';
const pending = (p: RunsPage | undefined) => Boolean(p?.runs.some((r) => r.analysisState === 'queued' || r.analysisState === 'running'));

/**
 * The runs list: filters and sort kept in the URL (shareable), one page at a time from
 * GET /api/runs, refreshed every 2 s while a listed run is waiting or being analysed.
 */
export function RunsBrowser({ initialQuery, initialPage, options }: { initialQuery: RunsQuery; initialPage: RunsPage; options: RunsOptions }) {
  const [query, setQuery] = useState<RunsQuery>(initialQuery);
  const qs = toQueryString(query);
  const initialQs = toQueryString(initialQuery);
  const { data, isFetching, error } = useQuery({
    queryKey: ['runs', qs],
    queryFn: () => fetchJson<RunsPage>(`/api/runs${qs ? `?${qs}` : ''}`),
    initialData: qs === initialQs ? initialPage : undefined,
    placeholderData: keepPreviousData,
    refetchInterval: (q) => (pending(q.state.data) ? 2000 : false),
  });

  const go = (next: RunsQuery, push = false) => {
    setQuery(next);
    const s = toQueryString(next);
    // Next's router picks up native history calls; a new filter replaces the entry, a page turn adds one.
    window.history[push ? 'pushState' : 'replaceState'](null, '', `/runs${s ? `?${s}` : ''}`);
  };
  const set = (key: keyof RunsQuery, value: string) => go({ ...query, [key]: value, page: '1' });
  const page = data ?? initialPage;
  const first = page.total === 0 ? 0 : (page.page - 1) * page.pageSize + 1;
  const last = Math.min(page.total, page.page * page.pageSize);
  const pages = Math.max(1, Math.ceil(page.total / page.pageSize));

  return (
    <div className="flex flex-col gap-4">
      <form
        className="grid grid-cols-2 gap-3 md:grid-cols-4 xl:grid-cols-8"
        aria-label="Filter runs"
        onSubmit={(e) => {
          e.preventDefault();
          const f = new FormData(e.currentTarget);
          go({ ...query, shift: String(f.get('shift') ?? ''), operator: String(f.get('operator') ?? ''), page: '1' });
        }}
      >
        <Select label="Design" value={query.design} onChange={(v) => set('design', v)} options={options.designs} all="All designs" />
        <Select label="Chamber" value={query.chamber} onChange={(v) => set('chamber', v)} options={options.chambers} all="All chambers" />
        <TextFilter label="Shift" name="shift" value={query.shift} />
        <TextFilter label="Operator" name="operator" value={query.operator} />
        <DateFilter label="From" value={query.from} onChange={(v) => set('from', v)} />
        <DateFilter label="To" value={query.to} onChange={(v) => set('to', v)} />
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Analysis
          <select className={inputClass} value={query.state ?? ''} onChange={(e) => set('state', e.target.value)}>
            <option value="">Any state</option>
            <option value="queued">waiting</option>
            <option value="running">analysing</option>
            <option value="done">analysed</option>
            <option value="failed">failed</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Sort
          <select className={inputClass} value={query.sort ?? '-startedAt'} onChange={(e) => set('sort', e.target.value)}>
            {Object.entries(sortLabels).map(([v, l]) => (
              <option key={v} value={v}>
                {l}
              </option>
            ))}
          </select>
        </label>
        <label className="col-span-2 flex items-center gap-2 text-sm md:col-span-4 xl:col-span-8">
          <input type="checkbox" checked={query.flagged === 'true'} onChange={(e) => set('flagged', e.target.checked ? 'true' : '')} />
          Only runs that need attention (a cut outside tolerance, a warning or a failed analysis)
          <button type="submit" className="ml-auto rounded-md border border-paper-line bg-paper-raised px-3 py-1 text-sm hover:bg-paper-sunk">
            Apply
          </button>
        </label>
      </form>

      {error ? (
        <p role="alert" className="rounded-md bg-alarm-light px-3 py-2 text-sm text-alarm">
          The list could not be loaded: {error.message}
        </p>
      ) : null}

      {page.runs.length === 0 ? (
        <p className="text-ink-soft" data-testid="runs-empty">
          {qs && qs !== 'page=1' ? 'No run matches these filters.' : 'No runs yet. A run appears here once its monitor trace is stored.'}
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table className={`w-full min-w-[60rem] text-left text-sm ${isFetching ? 'opacity-80' : ''}`} data-testid="runs-table">
            <thead className="text-xs uppercase tracking-wider text-ink-faint">
              <tr>
                <th className="pb-2 pr-4 font-medium">Run</th>
                <th className="pb-2 pr-4 font-medium">Design</th>
                <th className="pb-2 pr-4 font-medium">Chamber</th>
                <th className="pb-2 pr-4 font-medium">Operator</th>
                <th className="pb-2 pr-4 font-medium">Shift</th>
                <th className="pb-2 pr-4 font-medium">Date</th>
                <th className="pb-2 pr-4 font-medium">Analysis</th>
                <th className="pb-2 pr-4 text-right font-medium whitespace-nowrap">
                  Worst |cut error|
                  <span className="block normal-case tracking-normal">% QWOT</span>
                </th>
                <th className="pb-2 font-medium">Attention</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-paper-line">
              {page.runs.map((r) => (
                <tr key={r.id} data-run-code={r.runCode} data-flagged={r.flagged ? 'true' : 'false'} className={r.flagged ? 'bg-alarm-light/40' : undefined}>
                  <td className="py-2 pr-4 font-mono whitespace-nowrap">
                    <Link className="text-fringe underline-offset-2 hover:underline" href={r.url}>
                      {r.runCode}
                    </Link>
                  </td>
                  <td className="py-2 pr-4">
                    {r.design.name} <span className="text-xs text-ink-faint">rev. {r.design.revision}</span>
                  </td>
                  <td className="py-2 pr-4 whitespace-nowrap">{r.chamber}</td>
                  <td className="py-2 pr-4">{r.operator ?? '–'}</td>
                  <td className="py-2 pr-4">{r.shift ?? '–'}</td>
                  <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap text-ink-soft">{r.startedAt?.slice(0, 10) ?? '–'}</td>
                  <td className="py-2 pr-4 whitespace-nowrap" data-testid="run-analysis-state">
                    <AnalysisStateBadge state={r.analysisState} />
                  </td>
                  <td className="py-2 pr-4 text-right font-mono whitespace-nowrap">{fixed(r.worstCutErrorQwotPct, 2)}</td>
                  <td className="py-2 min-w-40">
                    <AttentionFlag run={r} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}

      <nav aria-label="Pages" className="flex flex-wrap items-center gap-3 text-sm text-ink-soft">
        <span data-testid="runs-count">
          {page.total === 0 ? 'No runs' : `Runs ${first}–${last} of ${page.total}`}
        </span>
        <button type="button" className="rounded-md border border-paper-line px-3 py-1 disabled:opacity-40" disabled={page.page <= 1} onClick={() => go({ ...query, page: String(page.page - 1) }, true)}>
          ← Newer page
        </button>
        <span>
          page {page.page} of {pages}
        </span>
        <button type="button" className="rounded-md border border-paper-line px-3 py-1 disabled:opacity-40" disabled={page.page >= pages} onClick={() => go({ ...query, page: String(page.page + 1) }, true)}>
          Next page →
        </button>
      </nav>
    </div>
  );
}

function Select({ label, value, onChange, options, all }: { label: string; value?: string; onChange: (v: string) => void; options: string[]; all: string }) {
  return (
    <label className="flex min-w-0 flex-col gap-1 text-xs text-ink-soft">
      {label}
      <select className={`${inputClass} min-w-0`} value={value ?? ''} onChange={(e) => onChange(e.target.value)}>
        <option value="">{all}</option>
        {options.map((o) => (
          <option key={o} value={o}>
            {o}
          </option>
        ))}
      </select>
    </label>
  );
}

function TextFilter({ label, name, value }: { label: string; name: string; value?: string }) {
  return (
    <label className="flex flex-col gap-1 text-xs text-ink-soft">
      {label}
      <input className={inputClass} name={name} defaultValue={value ?? ''} placeholder="any" />
    </label>
  );
}

function DateFilter({ label, value, onChange }: { label: string; value?: string; onChange: (v: string) => void }) {
  return (
    <label className="flex flex-col gap-1 text-xs text-ink-soft">
      {label}
      <input type="date" className={inputClass} value={value ?? ''} onChange={(e) => onChange(e.target.value)} />
    </label>
  );
}
