'use client';

import { useCallback, useEffect, useMemo, useRef } from 'react';
import type uPlot from 'uplot';
import { Plot, axis, plotPalette } from '@/components/plot';
import { drawBands, drawMarks, layerAt, type TraceLayerSpan, type TracePin } from './traceMarks';
import { toPlotData, useTraceSeries, type SeriesPayload } from './useTraceSeries';

export type TracePlotProps = {
  runId: number;
  analysisId: number | null;
  /** The whole-run overview, when the page already has it. */
  initial?: SeriesPayload | null;
  spans: TraceLayerSpan[];
  pins: TracePin[];
  selectedLayer: number | null;
  /** Zooms to this layer whenever nonce changes. */
  focus: { layer: number; nonce: number } | null;
  pinning: boolean;
  onTogglePinning: () => void;
  onSelectLayer: (layer: number) => void;
  onPin: (timeS: number, layer: number | null) => void;
};

const Y_AXIS_PX = 64;
const btn = 'rounded-md border border-paper-line bg-paper-raised px-2.5 py-1 text-sm hover:bg-paper-sunk';

/**
 * The run's trace: measured reading and fitted model over quiet layer bands, Fringelog's cut
 * marks, chip changes, trigger levels and pinned notes, with a residual strip below that follows
 * its zoom. Drag or wheel to zoom, buttons or keys to pan; a click selects the layer under it,
 * or pins a note there when pinning is on.
 */
export function TracePlot(p: TracePlotProps) {
  const { overview, error, fetchWindow } = useTraceSeries(p.runId, p.analysisId, p.initial ?? null);
  const main = useRef<uPlot | null>(null);
  const strip = useRef<uPlot | null>(null);
  const live = useRef(p);
  live.current = p;
  const quiet = useRef(false);
  const box = useRef<HTMLDivElement>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const data = useMemo(() => (overview ? toPlotData(overview) : null), [overview]);
  const full = useMemo<[number, number] | null>(() => (overview && overview.timeS.length > 1 ? [overview.timeS[0], overview.timeS[overview.timeS.length - 1]] : null), [overview]);

  const setRange = useCallback(
    (min: number, max: number) => {
      if (!main.current || !full) return;
      const span = Math.min(max - min, full[1] - full[0]);
      const lo = Math.max(full[0], Math.min(min, full[1] - span));
      main.current.setScale('x', { min: lo, max: lo + span });
    },
    [full],
  );

  // After the view settles, load the window at full resolution (or go back to the overview).
  const onRange = useRef<(min: number, max: number) => void>(() => {});
  onRange.current = (min, max) => {
    strip.current?.setScale('x', { min, max });
    // The visible range, for tests and for anyone reading the page's markup.
    box.current?.setAttribute('data-view-from', min.toFixed(3));
    box.current?.setAttribute('data-view-to', max.toFixed(3));
    if (quiet.current || !full || !overview) return;
    clearTimeout(timer.current);
    timer.current = setTimeout(() => {
      const wide = max - min >= 0.95 * (full[1] - full[0]);
      void (wide ? Promise.resolve(overview) : fetchWindow(min, max)).then((payload) => {
        const u = main.current;
        if (!payload || !u || u.scales.x.min !== min || u.scales.x.max !== max) return;
        const d = toPlotData(payload);
        // New data with its scales reset (y ranges itself to it), then back to the view asked for.
        quiet.current = true;
        u.setData(d.main);
        strip.current?.setData(d.residual);
        u.setScale('x', { min, max });
        strip.current?.setScale('x', { min, max });
        quiet.current = false;
        box.current?.setAttribute('data-points', String(payload.timeS.length));
      });
    }, 180);
  };

  const syncKey = `run-${p.runId}`;
  const mainOptions = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(
    () => ({
      legend: { show: false },
      // The same right padding on both plots keeps their time axes aligned.
      padding: [8, 18, null, null],
      scales: { x: { time: false } },
      cursor: { drag: { x: true, y: false }, sync: { key: syncKey } },
      series: [
        { label: 'time, s' },
        { label: 'Measured', stroke: plotPalette.measured, width: 1 },
        { label: 'Fitted model', stroke: plotPalette.model, width: 2.25 },
      ],
      axes: [axis('time into the run, s'), axis('detector reading', { size: Y_AXIS_PX })],
      hooks: {
        drawClear: [(u) => drawBands(u, live.current.spans, live.current.selectedLayer)],
        draw: [(u) => drawMarks(u, live.current.spans, live.current.pins)],
        setScale: [(u, key) => key === 'x' && onRange.current(u.scales.x.min!, u.scales.x.max!)],
        ready: [
          (u) => {
            let down: { x: number; y: number } | null = null;
            u.over.addEventListener('mousedown', (e) => (down = { x: e.clientX, y: e.clientY }));
            u.over.addEventListener('mouseup', (e) => {
              if (!down || Math.hypot(e.clientX - down.x, e.clientY - down.y) > 4) return;
              const t = u.posToVal(e.offsetX, 'x');
              const span = layerAt(live.current.spans, t);
              if (live.current.pinning) live.current.onPin(t, span?.layer ?? null);
              else if (span) live.current.onSelectLayer(span.layer);
            });
            u.over.addEventListener(
              'wheel',
              (e) => {
                e.preventDefault();
                const { min, max } = u.scales.x;
                if (min === undefined || max === undefined) return;
                const t = u.posToVal(e.offsetX, 'x');
                const f = e.deltaY > 0 ? 1.25 : 0.8;
                zoomAround.current(t, (max - min) * f, (t - min) / (max - min));
              },
              { passive: false },
            );
          },
        ],
      },
    }),
    [syncKey],
  );
  const stripOptions = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(
    () => ({
      legend: { show: false },
      padding: [4, 18, 4, null],
      scales: { x: { time: false } },
      cursor: { drag: { x: false, y: false }, sync: { key: syncKey } },
      series: [{ label: 'time, s' }, { label: 'Measured − model', stroke: plotPalette.residual, width: 1 }],
      axes: [axis('', { show: false }), axis('residual', { size: Y_AXIS_PX })],
    }),
    [syncKey],
  );

  const zoomAround = useRef<(t: number, width: number, at: number) => void>(() => {});
  zoomAround.current = (t, width, at) => {
    if (!full) return;
    const w = Math.max(width, (full[1] - full[0]) / 20000);
    setRange(t - at * w, t - at * w + w);
  };

  useEffect(() => {
    main.current?.redraw(false);
  }, [p.selectedLayer, p.pins, p.spans]);

  const focusNonce = p.focus?.nonce;
  useEffect(() => {
    const span = p.spans.find((s) => s.layer === p.focus?.layer);
    if (!span || !main.current) return;
    const pad = 0.08 * (span.cutTimeS - span.startTimeS);
    setRange(span.startTimeS - pad, Math.max(span.cutTimeS, span.idealCutTimeS ?? span.cutTimeS) + pad);
    // Only a new focus request (or the first data) moves the view.
  }, [focusNonce, data]);

  function view(): [number, number] | null {
    const x = main.current?.scales.x;
    return x && x.min !== undefined && x.max !== undefined ? [x.min, x.max] : null;
  }
  const pan = (fraction: number) => {
    const v = view();
    if (v) setRange(v[0] + fraction * (v[1] - v[0]), v[1] + fraction * (v[1] - v[0]));
  };
  const zoom = (factor: number) => {
    const v = view();
    if (v) zoomAround.current((v[0] + v[1]) / 2, (v[1] - v[0]) * factor, 0.5);
  };
  const whole = () => full && setRange(full[0], full[1]);
  const step = (by: number) => {
    const v = view();
    if (!v || p.spans.length === 0) return;
    const i = p.spans.findIndex((s) => s.layer === p.selectedLayer);
    const next = p.spans[Math.min(p.spans.length - 1, Math.max(0, i < 0 ? 0 : i + by))];
    p.onSelectLayer(next.layer);
  };

  function onKeyDown(e: React.KeyboardEvent) {
    const keys: Record<string, () => void> = {
      ArrowLeft: () => pan(-0.25),
      ArrowRight: () => pan(0.25),
      '+': () => zoom(0.5),
      '=': () => zoom(0.5),
      '-': () => zoom(2),
      '0': whole,
      Home: whole,
      '[': () => step(-1),
      ']': () => step(1),
      n: () => {
        const v = view();
        if (v) p.onPin((v[0] + v[1]) / 2, layerAt(p.spans, (v[0] + v[1]) / 2)?.layer ?? null);
      },
    };
    const act = keys[e.key];
    if (act) {
      e.preventDefault();
      act();
    }
  }

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2" role="toolbar" aria-label="Trace view">
        <button type="button" className={btn} onClick={() => pan(-0.25)} aria-label="Pan earlier">◀</button>
        <button type="button" className={btn} onClick={() => pan(0.25)} aria-label="Pan later">▶</button>
        <button type="button" className={btn} onClick={() => zoom(0.5)} aria-label="Zoom in">+</button>
        <button type="button" className={btn} onClick={() => zoom(2)} aria-label="Zoom out">−</button>
        <button type="button" className={btn} onClick={whole}>Whole run</button>
        <button
          type="button"
          aria-pressed={p.pinning}
          onClick={p.onTogglePinning}
          className={`rounded-md border px-2.5 py-1 text-sm ${p.pinning ? 'border-film bg-film-light text-film' : 'border-paper-line bg-paper-raised hover:bg-paper-sunk'}`}
        >
          {p.pinning ? 'Click the trace to pin…' : 'Pin a note'}
        </button>
      </div>
      {/* The plot takes the keyboard: arrows pan, + and − zoom, 0 whole run, [ and ] step layers, n pins a note at the centre. */}
      <div
        ref={box}
        tabIndex={0}
        onKeyDown={onKeyDown}
        data-testid="trace-plot"
        aria-label="Trace plot. Arrow keys pan, plus and minus zoom, 0 shows the whole run, square brackets step through the layers, n pins a note at the centre."
        className={`rounded-md border border-paper-line bg-paper-raised p-1 ${p.pinning ? 'cursor-crosshair' : ''}`}
      >
        {error ? (
          <p className="p-4 text-sm text-alarm">{error}</p>
        ) : !data ? (
          <p className="p-4 text-sm text-ink-soft">Loading the trace…</p>
        ) : (
          <>
            <Plot options={mainOptions} data={data.main} heightPx={320} keepZoom onCreate={(u) => (main.current = u)} label="Measured reading and fitted model against time, with the layers as bands" />
            <Plot options={stripOptions} data={data.residual} heightPx={90} keepZoom onCreate={(u) => (strip.current = u)} label="Residual: measured minus model against time" />
          </>
        )}
      </div>
    </div>
  );
}
