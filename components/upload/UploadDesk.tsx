'use client';

import { useRef, useState } from 'react';
import { sendUpload } from './sendUpload';
import { formFromHeader, readTraceHeader, type UploadForm } from './traceHeader';
import { UploadCard, type DesignChoice, type UploadItem } from './UploadCard';

/** The metadata lines sit at the top; 64 kB is far more than any header. */
const HEADER_BYTES = 64 * 1024;
let nextKey = 0;

/** The upload page: drop or choose traces, confirm each one's fields, send them, watch them analysed. */
export function UploadDesk({ designs, chambers }: { designs: DesignChoice[]; chambers: string[] }) {
  const [items, setItems] = useState<UploadItem[]>([]);
  const [over, setOver] = useState(false);
  const picker = useRef<HTMLInputElement>(null);
  const update = (key: string, patch: Partial<UploadItem>) => setItems((all) => all.map((i) => (i.key === key ? { ...i, ...patch } : i)));

  const add = async (files: FileList | File[]) => {
    const fresh = await Promise.all(
      [...files].map(async (file): Promise<UploadItem> => {
        const meta = readTraceHeader(await file.slice(0, HEADER_BYTES).text());
        return { key: `u${++nextKey}`, file, form: formFromHeader(meta, designs, chambers), stage: 'ready', progress: 0 };
      }),
    );
    setItems((all) => [...all, ...fresh]);
  };

  const upload = async (item: UploadItem) => {
    update(item.key, { stage: 'uploading', progress: 0, error: undefined });
    const answer = await sendUpload(item.file, item.form, (progress) => update(item.key, { progress }));
    if (answer.ok) update(item.key, { stage: 'stored', progress: 1, run: { ...answer.run, runCode: answer.run.runCode ?? item.form.runCode }, analyses: answer.analyses });
    else update(item.key, { stage: 'refused', error: answer.error });
  };
  const ready = items.filter((i) => i.stage === 'ready' && i.form.design && i.form.chamber && i.form.runCode.trim());

  return (
    <div className="flex flex-col gap-4">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => {
          e.preventDefault();
          setOver(false);
          void add(e.dataTransfer.files);
        }}
        className={`flex flex-col items-center gap-2 rounded-lg border-2 border-dashed px-4 py-8 text-center ${over ? 'border-fringe bg-fringe-light' : 'border-paper-line bg-paper-raised'}`}
      >
        <p className="text-sm text-ink-soft">Drop monitor traces (CSV) here, one or several, or</p>
        <button type="button" onClick={() => picker.current?.click()} className="rounded-md border border-paper-line bg-paper-raised px-4 py-1.5 text-sm font-medium hover:bg-paper-sunk">
          Choose files…
        </button>
        <input
          ref={picker}
          type="file"
          accept=".csv,.tsv,.txt,text/csv,text/plain"
          multiple
          className="sr-only"
          data-testid="trace-input"
          onChange={(e) => {
            if (e.target.files) void add(e.target.files);
            e.target.value = '';
          }}
        />
        <p className="text-xs text-ink-faint">Each file&apos;s “# key: value” lines fill its fields below; check them before sending.</p>
      </div>

      {ready.length > 1 ? (
        <button type="button" onClick={() => ready.forEach((i) => void upload(i))} className="self-start rounded-md bg-fringe px-4 py-1.5 text-sm font-medium text-paper-raised hover:bg-fringe-dark">
          Upload all {ready.length}
        </button>
      ) : null}

      <ul className="flex flex-col gap-4">
        {items.map((item) => (
          <UploadCard
            key={item.key}
            item={item}
            designs={designs}
            chambers={chambers}
            onChange={(form: UploadForm) => update(item.key, { form })}
            onUpload={() => void upload(item)}
            onRemove={() => setItems((all) => all.filter((i) => i.key !== item.key))}
          />
        ))}
      </ul>
    </div>
  );
}
