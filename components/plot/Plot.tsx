'use client';

import { useEffect, useMemo, useRef, useState } from 'react';
import UplotReact from 'uplot-react';
import type uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

export interface PlotProps {
  /** uPlot options without width and height: the plot takes its container's width. */
  options: Omit<uPlot.Options, 'width' | 'height'>;
  data: uPlot.AlignedData;
  /** @default 280 */
  heightPx?: number;
  /** Keep the user's zoom when data changes. @default false */
  keepZoom?: boolean;
  onCreate?: (chart: uPlot) => void;
  /** Read by screen readers in place of the canvas. */
  label: string;
  className?: string;
}

/**
 * The one uPlot wrapper of the app. uplot-react rebuilds the chart whenever `options` changes
 * identity, so the options object is memoised on the width alone; the caller memoises its own.
 */
export function Plot({ options, data, heightPx = 280, keepZoom = false, onCreate, label, className }: PlotProps) {
  const box = useRef<HTMLDivElement>(null);
  const [widthPx, setWidthPx] = useState(0);

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => setWidthPx(Math.floor(entry.contentRect.width)));
    observer.observe(el);
    return () => observer.disconnect();
  }, []);

  const sized = useMemo(() => ({ ...options, width: widthPx, height: heightPx }) as uPlot.Options, [options, widthPx, heightPx]);

  return (
    <div ref={box} className={`min-w-0 ${className ?? ''}`} role="img" aria-label={label}>
      {widthPx > 0 && <UplotReact options={sized} data={data} onCreate={onCreate} resetScales={!keepZoom} />}
    </div>
  );
}
