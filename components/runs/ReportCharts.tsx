'use client';

import { IndexPlot, type IndexSeries } from './RunCharts';
import { TracePlot } from './TracePlot';
import type { TraceLayerSpan, TracePin } from './traceMarks';
import type { SeriesPayload } from './useTraceSeries';

const none = () => {};

/*
 * Charts of the printable report. Canvas does not re-lay itself out when the browser prints, so
 * the charts are drawn at a fixed width that fits an A4 page inside its margins (182 mm ≈ 688 px
 * at the 96 px/in of CSS); the trace's pan and zoom buttons are left off paper.
 */
const paperWidth = 'w-[680px] max-w-full';

export function ReportTrace({ runId, analysisId, overview, spans, pins }: { runId: number; analysisId: number; overview: SeriesPayload | null; spans: TraceLayerSpan[]; pins: TracePin[] }) {
  return (
    <div className={`${paperWidth} [&_[role=toolbar]]:hidden`} data-testid="report-trace">
      <TracePlot
        runId={runId}
        analysisId={analysisId}
        initial={overview}
        spans={spans}
        pins={pins}
        selectedLayer={null}
        focus={null}
        pinning={false}
        onTogglePinning={none}
        onSelectLayer={none}
        onPin={none}
      />
      <p className="mt-1 text-[11px] text-ink-soft">
        Thin grey line: measured reading; thick teal line: fitted model; strip below: measured − model. Marks above the trace are the cuts
        (● within, ▲ near the limit, ■ outside tolerance), each layer labelled by number and material; a vertical line is a
        chip change; numbered flags are the notes listed with the comments.
      </p>
    </div>
  );
}

export function ReportIndexPlot({ series, wavelengthNm }: { series: IndexSeries[]; wavelengthNm: number | null }) {
  return (
    <div className={paperWidth} data-testid="report-index">
      <IndexPlot series={series} wavelengthNm={wavelengthNm} />
    </div>
  );
}
