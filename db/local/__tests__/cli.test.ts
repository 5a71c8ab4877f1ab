import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { afterAll, describe, expect, it } from 'vitest';
import { layerSpectrum } from '../../../analysis/fit/layerSpectrum';

// The launcher behind `npm run spectrum|plan|analyze` (db/local/cli.mjs): the bundle it builds
// must print what tsx prints, be reused while its sources are unchanged, and never run stale;
// nor may V8's code cache beside it be read for another bundle.
const root = path.resolve(import.meta.dirname, '../../..');
const design = path.join(root, 'analysis/design/__tests__/fixtures/hl7-reflector.json');
// inside the project: the bundle finds its packages from where it lies, as the real cache does
mkdirSync(path.join(root, 'node_modules/.cache'), { recursive: true });
const cache = mkdtempSync(path.join(root, 'node_modules/.cache/fringelog-cli-test-'));
afterAll(() => rmSync(cache, { recursive: true, force: true }));
const bundle = path.join(cache, 'plan.cjs');
/** The code caches beside the bundle. */
const caches = () => readdirSync(cache).filter((f) => f.startsWith('plan.cjs.') && f.endsWith('.v8cache'));

function launch(args: string[], cacheDir = cache) {
  const r = spawnSync(process.execPath, [path.join(root, 'db/local/cli.mjs'), ...args], {
    cwd: root, encoding: 'utf8', env: { ...process.env, FRINGELOG_CLI_CACHE: cacheDir },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const viaTsx = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [path.join(root, 'analysis/cli/plan.ts'), '--design', design], { cwd: root, encoding: 'utf8' });

describe('db/local/cli.mjs', () => {
  it('builds a bundle on first use that prints exactly what tsx prints', () => {
    const r = launch(['plan', '--design', design]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(viaTsx.stdout);
    const head = readFileSync(bundle, 'utf8').split('\n', 1)[0];
    const key = JSON.parse(head.replace('// fringelog-cli ', '')) as { inputs: string[] };
    expect(key.inputs).toContain('analysis/cli/plan.ts');
    expect(key.inputs).toContain('tsconfig.json');
  });

  it('holds its packages (zod) in the one file, not imported from node_modules at start-up', () => {
    const text = readFileSync(bundle, 'utf8');
    const required = [...text.matchAll(/\brequire\("([^"]+)"\)/g)].map((m) => m[1]);
    expect(required.length).toBeGreaterThan(0);
    expect(required.every((name) => name.startsWith('node:'))).toBe(true);
    const key = JSON.parse(text.split('\n', 1)[0].replace('// fringelog-cli ', '')) as { inputs: string[] };
    expect(key.inputs.some((f) => f.startsWith('node_modules/zod/'))).toBe(true);
  });

  it('reuses the bundle while its sources are unchanged', () => {
    const before = statSync(bundle).mtimeMs;
    expect(launch(['plan', '--design', design]).stdout).toBe(viaTsx.stdout);
    expect(statSync(bundle).mtimeMs).toBe(before);
  });

  it("runs from V8's code cache made by the first run, and makes it again where V8 refuses it", () => {
    const made = caches();
    expect(made).toHaveLength(1);
    const hash = (JSON.parse(readFileSync(bundle, 'utf8').split('\n', 1)[0].replace('// fringelog-cli ', '')) as { hash: string }).hash;
    // named for the bundle it was made from
    expect(made[0].startsWith(`plan.cjs.${hash.slice(0, 16)}.`)).toBe(true);
    const file = path.join(cache, made[0]);
    const bytes = readFileSync(file);
    expect(bytes.length).toBeGreaterThan(1000);
    expect(launch(['plan', '--design', design]).stdout).toBe(viaTsx.stdout);
    expect(readFileSync(file).equals(bytes)).toBe(true);
    // a cache V8 refuses (here not one at all) is not run, and is made again
    writeFileSync(file, 'not a code cache');
    expect(launch(['plan', '--design', design]).stdout).toBe(viaTsx.stdout);
    expect(readFileSync(file).length).toBeGreaterThan(1000);
  });

  it('rebuilds a bundle whose recorded sources differ from the tree, and does not run it', () => {
    const text = readFileSync(bundle, 'utf8');
    const head = text.slice(0, text.indexOf('\n'));
    // a bundle made from other sources: its hash no longer matches, its body prints something else
    writeFileSync(bundle, `${head.replace(/"hash":"[0-9a-f]+"/, `"hash":"${'0'.repeat(64)}"`)}\nconsole.log('stale');\n`);
    // …nor the code cache made from the stale bundle: its name no longer matches
    const before = caches();
    const stale = path.join(cache, before[0].replace(/^plan\.cjs\.[0-9a-f]{16}\./, `plan.cjs.${'0'.repeat(16)}.`));
    writeFileSync(stale, readFileSync(path.join(cache, before[0])));
    const r = launch(['plan', '--design', design]);
    expect(r.stdout).toBe(viaTsx.stdout);
    expect(readFileSync(bundle, 'utf8')).toBe(text);
    // a rebuild removes the caches of other bundles of the command
    expect(caches()).toEqual(before);
  });

  it('passes exit codes and messages through', () => {
    const r = launch(['plan', '--design', path.join(cache, 'missing.json')]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^plan: .*missing\.json: cannot read file: no such file/);
    expect(launch(['nonsense']).code).toBe(2);
  });

  it('runs through tsx when no bundle can be written', () => {
    const notADir = path.join(cache, 'a-file');
    writeFileSync(notADir, '');
    const r = launch(['plan', '--design', design], path.join(notADir, 'cache'));
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(viaTsx.stdout);
  });
});

describe('db/local/cliRun.mjs', () => {
  // analyze's own thread, started when the launcher's early one failed: told no bundle, it runs the current one
  it('a thread on the bundles\' entry with no bundle named runs the current analyze bundle', async () => {
    const traceFile = path.join(root, 'sample-traces/bay1-ar1-run0412.csv');
    expect(launch(['analyze', '--design', path.join(root, 'sample-traces/ar1-mgf2-crown.json'), '--trace', traceFile]).code).toBe(0);
    const claims = new Int32Array(new SharedArrayBuffer(4 * (1 << 14)));
    const worker = new Worker(new URL(pathToFileURL(path.join(root, 'db/local/cliRun.mjs'))), {
      workerData: { role: 'fringelog-layer-spectra', claims }, env: { ...process.env, FRINGELOG_CLI_CACHE: cache },
    });
    const tauS = Float64Array.from({ length: 400 }, (_, i) => i * 0.5);
    const y = tauS.map((s) => 0.5 + 0.3 * Math.sin(s / 9));
    const answered = new Promise<{ id: number; spectrum: unknown; skipped: boolean }>((resolve, reject) => {
      worker.once('message', resolve);
      worker.once('error', reject);
    });
    worker.postMessage({ id: 0, tauS, y, wavelengthNm: 550, index: 2.1 });
    const m = await answered;
    await worker.terminate();
    expect(m).toEqual({ id: 0, spectrum: layerSpectrum(tauS, y, 550, 2.1), skipped: false });
  }, 30_000);
});
