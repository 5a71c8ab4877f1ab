'use client';

import type { ApiError } from '@/components/query/fetchJson';
import { formatBytes } from '@/components/runs/format';
import { AnalysisWatch } from './AnalysisWatch';
import type { UploadForm } from './traceHeader';

export type DesignChoice = { name: string; revision: number; layerCount: number };

export type UploadItem = {
  key: string;
  file: File;
  form: UploadForm;
  stage: 'ready' | 'uploading' | 'stored' | 'refused';
  progress: number;
  run?: { id: string; url: string; runCode: string };
  analyses?: { id: string; mode: 'sequential' | 'refit' }[];
  error?: ApiError;
};

const input = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 text-sm text-ink disabled:bg-paper-sunk disabled:text-ink-soft';

/** One trace on the upload page: its fields to confirm, its progress bar, then its analyses. */
export function UploadCard({ item, designs, chambers, onChange, onUpload, onRemove }: {
  item: UploadItem;
  designs: DesignChoice[];
  chambers: string[];
  onChange: (form: UploadForm) => void;
  onUpload: () => void;
  onRemove: () => void;
}) {
  const f = item.form;
  const locked = item.stage === 'uploading' || item.stage === 'stored';
  const set = (k: keyof UploadForm) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => onChange({ ...f, [k]: e.target.value });
  const names = [...new Set(designs.map((d) => d.name))];
  const revisions = designs.filter((d) => d.name === f.design);
  const missing = !f.design || !f.chamber || !f.runCode.trim();
  return (
    <li className="rounded-lg border border-paper-line bg-paper-raised p-4 shadow-sm" data-testid="upload-item" data-file={item.file.name} data-stage={item.stage}>
      <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <p className="font-mono text-sm break-all">{item.file.name}</p>
        <span className="text-xs text-ink-faint">{formatBytes(item.file.size)}</span>
      </div>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor={`${item.key}-design`}>Design</label>
          <select id={`${item.key}-design`} className={input} value={f.design} disabled={locked} onChange={(e) => {
            const newest = designs.filter((d) => d.name === e.target.value).map((d) => d.revision);
            onChange({ ...f, design: e.target.value, designRevision: newest.length ? String(Math.max(...newest)) : '' });
          }}>
            <option value="">Choose the design…</option>
            {names.map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-revision`}>Revision</label>
          <select id={`${item.key}-revision`} className={input} value={f.designRevision} disabled={locked || !f.design} onChange={set('designRevision')}>
            {revisions.map((d) => (
              <option key={d.revision} value={String(d.revision)}>
                rev. {d.revision} · {d.layerCount} layer{d.layerCount === 1 ? '' : 's'}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-chamber`}>Chamber</label>
          <select id={`${item.key}-chamber`} className={input} value={f.chamber} disabled={locked} onChange={set('chamber')}>
            <option value="">Choose…</option>
            {chambers.map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-runCode`}>Run code</label>
          <input id={`${item.key}-runCode`} className={`${input} font-mono`} value={f.runCode} disabled={locked} onChange={set('runCode')} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-shift`}>Shift</label>
          <input id={`${item.key}-shift`} className={input} value={f.shift} disabled={locked} onChange={set('shift')} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-operator`}>Operator</label>
          <input id={`${item.key}-operator`} className={input} value={f.operator} disabled={locked} onChange={set('operator')} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor={`${item.key}-startedAt`}>Date of the run</label>
          <input id={`${item.key}-startedAt`} type="date" className={input} value={f.startedAt} disabled={locked} onChange={set('startedAt')} />
        </div>
      </div>

      {item.stage === 'uploading' || item.stage === 'stored' ? (
        <div className="mt-3">
          <div className="h-2 overflow-hidden rounded bg-paper-sunk" role="progressbar" aria-label={`Upload of ${item.file.name}`} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(item.progress * 100)}>
            <div className="h-full bg-fringe transition-[width]" style={{ width: `${Math.round(item.progress * 100)}%` }} />
          </div>
          <p className="mt-1 text-xs text-ink-faint" data-testid="upload-progress">
            {item.stage === 'uploading' ? `Sending ${Math.round(item.progress * 100)} % of ${formatBytes(item.file.size)}; the server checks each row as it arrives` : 'Sent and checked.'}
          </p>
        </div>
      ) : null}

      {item.stage === 'refused' && item.error ? (
        <div role="alert" className="mt-3 rounded-md bg-alarm-light px-3 py-2 text-sm text-alarm" data-testid="upload-error">
          <p className="font-medium">
            Not stored
            {item.error.line ? ` — line ${item.error.line}${item.error.columnName ? `, column “${item.error.columnName}”` : ''}` : ''}
          </p>
          <p className="font-mono text-xs break-words">{item.error.message}</p>
        </div>
      ) : null}

      {item.stage === 'stored' && item.run && item.analyses ? (
        <div className="mt-3">
          <AnalysisWatch run={item.run} analyses={item.analyses} />
        </div>
      ) : null}

      {item.stage === 'ready' || item.stage === 'refused' ? (
        <div className="mt-3 flex flex-wrap items-center gap-2">
          <button type="button" onClick={onUpload} disabled={missing} className="rounded-md bg-fringe px-4 py-1.5 text-sm font-medium text-paper-raised hover:bg-fringe-dark disabled:opacity-50">
            {item.stage === 'refused' ? 'Try again' : 'Upload'}
          </button>
          <button type="button" onClick={onRemove} className="rounded-md border border-paper-line px-3 py-1.5 text-sm text-ink-soft hover:bg-paper-sunk">
            Remove
          </button>
          {missing ? <span className="text-xs text-ink-faint">Design, chamber and run code are needed.</span> : null}
        </div>
      ) : null}
    </li>
  );
}
