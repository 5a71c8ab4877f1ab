import { spawnSync } from 'node:child_process';
import { createReadStream, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { afterAll, describe, expect, it } from 'vitest';
import { parseDesign } from '../../design';
import { analyzeRun } from '../../fit/analyzeRun';
import { modelSquaredResiduals, type ModelResidualsRequest } from '../../fit/layerResult';
import { layerSampleWork } from '../../fit/layerSampleWork';
import { layerSpectrum } from '../../fit/layerSpectrum';
import { wanderPrepFromRequest } from '../../fit/wanderChoiceRequest';
import { wanderRequests } from '../../fit/__tests__/wanderLayers';
import { readTrace } from '../../trace';
import { startSpectrumThread } from '../spectrumThread';

const root = path.resolve(import.meta.dirname, '../../..');
const samples = path.join(root, 'sample-traces');

// the launcher's bundle, in a cache of this test's own inside the project (it finds node_modules there)
mkdirSync(path.join(root, 'node_modules/.cache'), { recursive: true });
const cache = mkdtempSync(path.join(root, 'node_modules/.cache/fringelog-cli-test-'));
afterAll(() => rmSync(cache, { recursive: true, force: true }));

describe('the analyze command computes spectra on a second thread', () => {
  it('answers from this thread when the other cannot start', async () => {
    const t = startSpectrumThread(pathToFileURL(path.join(root, 'no-such-module.mjs')));
    const tauS = Float64Array.from({ length: 400 }, (_, i) => i * 0.5);
    const y = tauS.map((s) => 0.5 + 0.3 * Math.sin(s / 9));
    const got = await t.spectrumOf(tauS, y, 550, 2.1);
    t.close();
    expect(got).toEqual(layerSpectrum(tauS, y, 550, 2.1));
    expect(got.fringeRateNmPerS).not.toBeNull();
  });

  it('computes here what it awaits before the thread has begun it (a thread that takes requests and never answers)', async () => {
    const stuck = path.join(cache, 'stuck.mjs');
    writeFileSync(stuck, "import { parentPort } from 'node:worker_threads';\nparentPort.on('message', () => {});\nsetInterval(() => {}, 1000);\n");
    const t = startSpectrumThread(pathToFileURL(stuck));
    const tauS = Float64Array.from({ length: 400 }, (_, i) => i * 0.5);
    const y = tauS.map((s) => 0.5 + 0.3 * Math.sin(s / 9));
    const got = await t.spectrumOf(tauS, y, 550, 2.1);
    t.close();
    expect(got).toEqual(layerSpectrum(tauS, y, 550, 2.1));
  }, 10_000);

  it('answers the samples\' other work from this thread too, as layerSampleWork does', async () => {
    const t = startSpectrumThread(pathToFileURL(path.join(root, 'no-such-module.mjs')));
    const tauS = Float64Array.from({ length: 600 }, (_, i) => i * 0.5);
    const y = tauS.map((s) => 0.5 + 0.3 * Math.sin(s / 9));
    const work = { timeS: tauS.map((s) => 100 + s), binPoints: [50, 400, 900] };
    const got = await t.spectrumOf(tauS, y, 550, 2.1, work);
    t.close();
    expect(got).toEqual({ ...layerSpectrum(tauS, y, 550, 2.1), ...layerSampleWork(tauS, y, work) });
    // bins of 12, 1.5 and (all 600 samples, unbinned) 1 samples
    expect(got.binned!.map((b) => b.tauS.length)).toEqual([50, 400, 600]);
    expect(got.binned![0].y[0]).toBeCloseTo(y.slice(0, 12).reduce((a, b) => a + b) / 12, 12);
    // sin(τ/9) turns at τ = 9·(π/2 + kπ): k = 0 … 10 within the 300 s, at 100 s + τ on the clock
    expect(got.observed!.points.map((p) => p.timeS)).toEqual(Array.from({ length: 11 }, (_, k) => expect.closeTo(100 + 9 * (Math.PI / 2 + k * Math.PI), 0)));
  });

  it('prepares the wander choices here, as wanderPrepFromRequest does, when the thread cannot start', async () => {
    const requests = wanderRequests([0, 0.03], 2);
    const t = startSpectrumThread(pathToFileURL(path.join(root, 'no-such-module.mjs')));
    const got = await Promise.all(requests.map((r) => t.wanderPrepOf(r)));
    t.close();
    expect(got).toEqual(requests.map((r) => wanderPrepFromRequest(r)));
  });

  it('prepares here a wander choice it awaits before the thread has begun it (a thread that never answers)', async () => {
    const stuck = path.join(cache, 'stuck-wander.mjs');
    writeFileSync(stuck, "import { parentPort } from 'node:worker_threads';\nparentPort.on('message', () => {});\nsetInterval(() => {}, 1000);\n");
    const [r] = wanderRequests([0.03], 5);
    const t = startSpectrumThread(pathToFileURL(stuck));
    const got = await t.wanderPrepOf(r);
    t.close();
    expect(got).toEqual(wanderPrepFromRequest(r));
  }, 10_000);

  // a single layer of n 2.1 growing at 0.5 nm/s on glass, read in transmission with noise of 1e-3
  const residualsRequest = (): ModelResidualsRequest => {
    const tauS = Float64Array.from({ length: 800 }, (_, i) => i * 0.25);
    const y = tauS.map((t, i) => 0.02 + 0.95 * (0.9 - 0.05 * Math.sin(t / 15)) + 1e-3 * Math.sin(i * 2.399));
    return {
      model: {
        optics: { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: false, wavelengthNm: 550, mode: 'T' },
        below: [], index: 2.1, extinction: 0, indexGradient: 0, thicknessNm: 100, law: { rateNmPerS: 0.5, rateDriftNmPerS2: 0 },
      },
      tauS, y, offset: 0.02, gain: 0.95,
    };
  };

  it("sums a layer's residuals here, as modelSquaredResiduals does, when the thread cannot start or has not begun it", async () => {
    const stuck = path.join(cache, 'stuck-residuals.mjs');
    writeFileSync(stuck, "import { parentPort } from 'node:worker_threads';\nparentPort.on('message', () => {});\nsetInterval(() => {}, 1000);\n");
    for (const entry of [pathToFileURL(path.join(root, 'no-such-module.mjs')), pathToFileURL(stuck)]) {
      const r = residualsRequest();
      const t = startSpectrumThread(entry);
      const got = await t.modelResidualsOf(r);
      t.close();
      expect(got).toBe(modelSquaredResiduals(r));
      expect(got).toBeGreaterThan(0);
    }
  }, 10_000);

  // db/local/cli.mjs starts the thread on the bundle before loading it; the command takes it over
  const EARLY = Symbol.for('fringelog.cli.earlyThread');
  const earlyThread = (entry: string, role: string) => {
    const claims = new Int32Array(new SharedArrayBuffer(4 * (1 << 14)));
    const worker = new Worker(new URL(entry), { workerData: { role, claims } });
    (globalThis as Record<symbol, unknown>)[EARLY] = { entry, worker, claims, failed: false };
    return worker;
  };
  const answering = () => {
    const file = path.join(cache, 'early.mjs');
    // claims each request and answers with the role it was started with
    writeFileSync(file, "import { parentPort, workerData } from 'node:worker_threads';\nparentPort.on('message', (r) => { Atomics.compareExchange(workerData.claims, r.id, 0, 2); parentPort.postMessage({ id: r.id, spectrum: { from: workerData.role } }); });\n");
    return pathToFileURL(file);
  };

  it('takes over the thread the launcher started on the same module', async () => {
    const entry = answering();
    earlyThread(entry.href, 'launcher');
    const t = startSpectrumThread(entry);
    const tauS = Float64Array.from({ length: 400 }, (_, i) => i * 0.5);
    const asked = t.spectrumOf(tauS, tauS, 550, 2.1);
    // not awaited until the thread has answered (awaited first, it is computed here)
    await new Promise((r) => setTimeout(r, 1000));
    expect(await asked).toEqual({ from: 'launcher' });
    expect((globalThis as Record<symbol, unknown>)[EARLY]).toBeUndefined();
    t.close();
  }, 10_000);

  it("ends, and does not use, a launcher's thread on another module", async () => {
    const worker = earlyThread(answering().href, 'launcher');
    const exited = new Promise((r) => worker.once('exit', r));
    const t = startSpectrumThread(pathToFileURL(path.join(root, 'no-such-module.mjs')));
    const tauS = Float64Array.from({ length: 400 }, (_, i) => i * 0.5);
    const y = tauS.map((s) => 0.5 + 0.3 * Math.sin(s / 9));
    expect(await t.spectrumOf(tauS, y, 550, 2.1)).toEqual(layerSpectrum(tauS, y, 550, 2.1));
    await exited;
    t.close();
  }, 10_000);

  // the four-layer AR (level cuts); the 17-layer mirror (turning-point cuts: the start delay's profiles on the thread too)
  it.each([['bbar4-visible.json', 'bay2-bb4-run0587.csv'], ['hr17-mirror-600.json', 'bay3-hr17-run1120.csv']])('the bundled command (thread on) prints what analyzeRun gives in process (no thread): %s', async (designName, traceName) => {
    const designFile = path.join(samples, designName);
    const traceFile = path.join(samples, traceName);
    const r = spawnSync(process.execPath, [path.join(root, 'db/local/cli.mjs'), 'analyze', '--design', designFile, '--trace', traceFile, '--mode', 'refit'], {
      cwd: root, encoding: 'utf8', env: { ...process.env, FRINGELOG_CLI_CACHE: cache }, maxBuffer: 64 * 2 ** 20,
    });
    expect(r.stderr).toBe('');
    const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);
    const trace = await readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
    const inProcess = await analyzeRun(design, trace, { mode: 'refit' });
    const { format, layers, warnings, ...rest } = inProcess;
    // as the command writes it (Float64Arrays as arrays)
    const asWritten = JSON.stringify({ format, layers, warnings, ...rest }, (_k, v: unknown) => (v instanceof Float64Array ? Array.from(v) : v));
    expect(r.stdout).toBe(`${asWritten}\n`);
  });

  it('a trace of over 4 MiB with warnings that read its samples: read on both threads, its warnings made on the second, the same output', async () => {
    const designFile = path.join(samples, 'bbar4-visible.json');
    const lines = readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8').split('\n');
    const header = lines.findIndex((l) => l.startsWith('time_s'));
    const pad = 'x'.repeat(600);
    // an ignored column makes the file large; ten rows dropped make a gap in time
    const padded = lines.filter((_, i) => i < header + 3000 || i >= header + 3010)
      .map((l, i) => (i < header || l === '' ? l : `${l},${i === header ? 'note' : pad}`)).join('\n');
    const traceFile = path.join(cache, 'bb4-padded.csv');
    writeFileSync(traceFile, padded);
    expect(padded.length).toBeGreaterThan(4 * 2 ** 20);
    const r = spawnSync(process.execPath, [path.join(root, 'db/local/cli.mjs'), 'analyze', '--design', designFile, '--trace', traceFile, '--mode', 'refit'], {
      cwd: root, encoding: 'utf8', env: { ...process.env, FRINGELOG_CLI_CACHE: cache }, maxBuffer: 64 * 2 ** 20,
    });
    expect(r.stderr).toBe('');
    const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);
    const trace = await readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
    expect(trace.warnings.map((w) => w.code)).toEqual(['unknown_column', 'time_gap']);
    const { format, layers, warnings, ...rest } = await analyzeRun(design, trace, { mode: 'refit' });
    const asWritten = JSON.stringify({ format, layers, warnings, ...rest }, (_k, v: unknown) => (v instanceof Float64Array ? Array.from(v) : v));
    expect(r.stdout).toBe(`${asWritten}\n`);
  }, 30_000);
});
