import 'server-only';
import { eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { analysisSeries, runSeries } from '../schema';

/** Samples per entry of run_series.time_index. */
export const TIME_INDEX_STRIDE = 1024;

export type SeriesOverview = { timeS: number[]; signal: number[]; model: (number | null)[] };

const toBytes = (a: Float64Array): Buffer => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/** Little-endian float64s from a bytea (copied when the Buffer is not 8-byte aligned). */
export function toFloat64(b: Buffer): Float64Array {
  if (b.byteOffset % 8 === 0) return new Float64Array(b.buffer, b.byteOffset, b.byteLength / 8);
  return new Float64Array(Uint8Array.from(b).buffer);
}

/** Stores a run's samples for plotting once (a second analysis of the run keeps the first copy). */
export async function storeRunSeries(runId: number, timeS: Float64Array, signal: Float64Array, ex: Executor = db()): Promise<void> {
  const index = new Float64Array(Math.ceil(timeS.length / TIME_INDEX_STRIDE));
  for (let k = 0; k < index.length; k++) index[k] = timeS[k * TIME_INDEX_STRIDE];
  await ex
    .insert(runSeries)
    .values({ runId, sampleCount: timeS.length, timeS: toBytes(timeS), signal: toBytes(signal), timeIndex: toBytes(index) })
    .onConflictDoNothing();
}

export async function hasRunSeries(runId: number, ex: Executor = db()): Promise<boolean> {
  const [row] = await ex.select({ n: runSeries.sampleCount }).from(runSeries).where(eq(runSeries.runId, runId));
  return row !== undefined;
}

/** The fitted model of an analysis at every sample, and its whole-run overview; written with the analysis's results. */
export async function storeAnalysisSeries(analysisId: number, model: Float64Array, overview: SeriesOverview, ex: Executor = db()): Promise<void> {
  await ex.insert(analysisSeries).values({ analysisId, model: toBytes(model), overview }).onConflictDoNothing();
}

export async function findOverview(analysisId: number, ex: Executor = db()): Promise<SeriesOverview | undefined> {
  const [row] = await ex.select({ overview: analysisSeries.overview }).from(analysisSeries).where(eq(analysisSeries.analysisId, analysisId));
  return row?.overview;
}

/** Every sample of the run (for an overview where no analysis has one). */
export async function readWholeRunSeries(runId: number, ex: Executor = db()): Promise<{ timeS: Float64Array; signal: Float64Array } | undefined> {
  const [row] = await ex.select({ timeS: runSeries.timeS, signal: runSeries.signal }).from(runSeries).where(eq(runSeries.runId, runId));
  return row ? { timeS: toFloat64(row.timeS), signal: toFloat64(row.signal) } : undefined;
}

async function slice(ex: Executor, table: 'run_series' | 'analysis_series', column: 'time_s' | 'signal' | 'model', key: number, from: number, to: number): Promise<Float64Array | null> {
  const keyColumn = table === 'run_series' ? 'run_id' : 'analysis_id';
  const result = await ex.execute<{ part: Buffer | null }>(
    sql`select substring(${sql.identifier(column)} from ${from * 8 + 1} for ${(to - from) * 8}) as part from ${sql.identifier(table)} where ${sql.identifier(keyColumn)} = ${key}`,
  );
  const part = result.rows[0]?.part;
  return part ? toFloat64(part) : null;
}

export type SeriesWindow = { sampleCount: number; startIndex: number; timeS: Float64Array; signal: Float64Array; model: Float64Array | null };

/**
 * The samples with fromS ≤ time ≤ toS at full resolution, and the model of the analysis over
 * them; read by substring, so only the window's bytes (and the small time index) leave the
 * database. Undefined when the run has no stored series.
 */
export async function readSeriesWindow(runId: number, analysisId: number | null, fromS: number, toS: number, ex: Executor = db()): Promise<SeriesWindow | undefined> {
  const [meta] = await ex.select({ sampleCount: runSeries.sampleCount, timeIndex: runSeries.timeIndex }).from(runSeries).where(eq(runSeries.runId, runId));
  if (!meta) return undefined;
  const index = toFloat64(meta.timeIndex);
  // The blocks that may hold the window: from the last block starting at or before fromS to the first starting after toS.
  let k0 = 0;
  while (k0 + 1 < index.length && index[k0 + 1] <= fromS) k0++;
  let k1 = k0;
  while (k1 < index.length && index[k1] <= toS) k1++;
  const blockFrom = k0 * TIME_INDEX_STRIDE;
  const blockTo = Math.min(meta.sampleCount, k1 * TIME_INDEX_STRIDE);
  const times = (await slice(ex, 'run_series', 'time_s', runId, blockFrom, blockTo)) ?? new Float64Array(0);
  let a = 0;
  while (a < times.length && times[a] < fromS) a++;
  let b = a;
  while (b < times.length && times[b] <= toS) b++;
  const start = blockFrom + a;
  const end = blockFrom + b;
  if (end <= start) return { sampleCount: meta.sampleCount, startIndex: start, timeS: new Float64Array(0), signal: new Float64Array(0), model: null };
  const signal = (await slice(ex, 'run_series', 'signal', runId, start, end))!;
  const model = analysisId === null ? null : await slice(ex, 'analysis_series', 'model', analysisId, start, end);
  return { sampleCount: meta.sampleCount, startIndex: start, timeS: times.slice(a, b), signal, model };
}

/** True when the analysis is one of the run's. */
export async function analysisOfRun(analysisId: number, runId: number, ex: Executor = db()): Promise<boolean> {
  const result = await ex.execute<{ ok: number }>(sql`select 1 as ok from analyses where id = ${analysisId} and run_id = ${runId}`);
  return result.rows.length === 1;
}
