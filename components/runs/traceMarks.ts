import type uPlot from 'uplot';
import { plotPalette } from '@/components/plot/palette';
import { gradeLooks, type ToleranceGrade } from './cutGrade';

/** What the trace plot marks of one layer. */
export type TraceLayerSpan = {
  layer: number;
  material: string;
  chip: number;
  startTimeS: number;
  cutTimeS: number;
  idealCutTimeS: number | null;
  grade: ToleranceGrade;
  /** Planned trigger level of a level cut, detector units; null for a turning-point cut. */
  triggerLevel: number | null;
};

export type TracePin = { id: number; timeS: number | null; layer: number | null; number: number };

const px = (v: number) => v * (typeof devicePixelRatio === 'number' ? devicePixelRatio : 1);

function segment(ctx: CanvasRenderingContext2D, colour: string, widthPx: number, x0: number, y0: number, x1: number, y1: number): void {
  ctx.strokeStyle = colour;
  ctx.lineWidth = px(widthPx);
  ctx.beginPath();
  ctx.moveTo(x0, y0);
  ctx.lineTo(x1, y1);
  ctx.stroke();
}

/** Where a pin sits in time: its own time, else the middle of its layer. */
export function pinTime(pin: TracePin, spans: readonly TraceLayerSpan[]): number | null {
  if (pin.timeS !== null) return pin.timeS;
  const s = spans.find((l) => l.layer === pin.layer);
  return s ? (s.startTimeS + s.cutTimeS) / 2 : null;
}

/** The layer being deposited at time t, if any. */
export function layerAt(spans: readonly TraceLayerSpan[], t: number): TraceLayerSpan | undefined {
  return spans.find((s) => t >= s.startTimeS && t <= s.cutTimeS);
}

/**
 * Quiet bands under the trace: one even tint per layer, a slightly deeper one for the selected
 * layer, and the layer's number and material named along the top.
 */
export function drawBands(u: uPlot, spans: readonly TraceLayerSpan[], selected: number | null): void {
  const { ctx } = u;
  const { top, height, left, width } = u.bbox;
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  ctx.font = `${px(11)}px sans-serif`;
  ctx.textBaseline = 'top';
  for (const s of spans) {
    const x0 = u.valToPos(s.startTimeS, 'x', true);
    const x1 = u.valToPos(s.cutTimeS, 'x', true);
    if (x1 < left || x0 > left + width) continue;
    ctx.fillStyle = s.layer === selected ? 'rgba(31, 95, 104, 0.16)' : plotPalette.band;
    ctx.fillRect(x0, top, Math.max(1, x1 - x0), height);
    const name = `${s.layer} ${s.material}`;
    if (x1 - x0 > ctx.measureText(name).width + px(6)) {
      ctx.fillStyle = plotPalette.inkFaint;
      ctx.fillText(name, Math.max(x0, left) + px(3), top + px(2));
    }
  }
  ctx.restore();
}

function gradeShape(ctx: CanvasRenderingContext2D, grade: ToleranceGrade, x: number, y: number, r: number): void {
  ctx.beginPath();
  if (grade === 'within') ctx.arc(x, y, r, 0, 2 * Math.PI);
  else if (grade === 'near') {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y + r * 0.8);
    ctx.lineTo(x - r, y + r * 0.8);
    ctx.closePath();
  } else ctx.rect(x - r * 0.85, y - r * 0.85, 1.7 * r, 1.7 * r);
  ctx.fill();
}

/**
 * Fringelog's cut mark, in a strip under the layer names: a solid mark at the actual cut, shaped
 * and coloured by its tolerance grade, tethered by a line to a hollow ring where the fit says the
 * cut belonged. Also chip changes (a solid rule with the chip named at the foot), the planned
 * trigger level of level cuts, and the pinned notes (a numbered flag at the foot).
 */
export function drawMarks(u: uPlot, spans: readonly TraceLayerSpan[], pins: readonly TracePin[], triggerScale = 'y'): void {
  const { ctx } = u;
  const { top, height, left, width } = u.bbox;
  const yStrip = top + px(22);
  const r = px(4.5);
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  ctx.font = `${px(11)}px sans-serif`;
  let chip: number | null = null;
  for (const s of spans) {
    if (chip !== null && s.chip !== chip) {
      const x = Math.round(u.valToPos(s.startTimeS, 'x', true)) - px(4);
      segment(ctx, plotPalette.chip, 1.5, x, top, x, top + height);
      ctx.fillStyle = plotPalette.chip;
      ctx.textBaseline = 'bottom';
      ctx.fillText(`chip ${s.chip}`, x + px(3), top + height - px(3));
    }
    chip = s.chip;
    const xCut = u.valToPos(s.cutTimeS, 'x', true);
    const look = gradeLooks[s.grade];
    if (s.idealCutTimeS !== null) {
      const xIdeal = u.valToPos(s.idealCutTimeS, 'x', true);
      segment(ctx, look.fill, 1.5, xIdeal, yStrip, xCut, yStrip);
      ctx.beginPath();
      ctx.arc(xIdeal, yStrip, r * 0.8, 0, 2 * Math.PI);
      ctx.fillStyle = plotPalette.paper;
      ctx.fill();
      ctx.stroke();
    }
    ctx.fillStyle = look.fill;
    gradeShape(ctx, s.grade, xCut, yStrip, r);
    if (s.triggerLevel !== null) {
      const y = u.valToPos(s.triggerLevel, triggerScale, true);
      const x0 = u.valToPos(s.startTimeS + 0.7 * (s.cutTimeS - s.startTimeS), 'x', true);
      segment(ctx, plotPalette.cut, 2, x0, y, xCut, y);
    }
  }
  for (const p of pins) {
    const t = pinTime(p, spans);
    if (t === null) continue;
    const x = u.valToPos(t, 'x', true);
    const yFoot = top + height - px(16);
    segment(ctx, plotPalette.annotation, 1.5, x, top + height, x, yFoot - px(10));
    ctx.fillStyle = plotPalette.annotation;
    ctx.fillRect(x, yFoot - px(10), px(16), px(12));
    ctx.fillStyle = '#fffdf8';
    ctx.textBaseline = 'top';
    ctx.fillText(String(p.number), x + px(3), yFoot - px(9));
  }
  ctx.restore();
}
