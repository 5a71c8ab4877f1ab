import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

// The launcher behind `npm run spectrum|plan|analyze` (db/local/cli.mjs): the bundle it builds
// must print what tsx prints, be reused while its sources are unchanged, and never run stale.
const root = path.resolve(import.meta.dirname, '../../..');
const design = path.join(root, 'analysis/design/__tests__/fixtures/hl7-reflector.json');
// inside the project: the bundle finds its packages from where it lies, as the real cache does
mkdirSync(path.join(root, 'node_modules/.cache'), { recursive: true });
const cache = mkdtempSync(path.join(root, 'node_modules/.cache/fringelog-cli-test-'));
afterAll(() => rmSync(cache, { recursive: true, force: true }));
const bundle = path.join(cache, 'plan.mjs');

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
    expect(text).not.toMatch(/^import .* from "zod";$/m);
    expect(text.match(/^import .* from "([^"]+)";$/gm)!.every((line) => line.includes('"node:'))).toBe(true);
    const key = JSON.parse(text.split('\n', 1)[0].replace('// fringelog-cli ', '')) as { inputs: string[] };
    expect(key.inputs.some((f) => f.startsWith('node_modules/zod/'))).toBe(true);
  });

  it('reuses the bundle while its sources are unchanged', () => {
    const before = statSync(bundle).mtimeMs;
    expect(launch(['plan', '--design', design]).stdout).toBe(viaTsx.stdout);
    expect(statSync(bundle).mtimeMs).toBe(before);
  });

  it('rebuilds a bundle whose recorded sources differ from the tree, and does not run it', () => {
    const text = readFileSync(bundle, 'utf8');
    const head = text.slice(0, text.indexOf('\n'));
    // a bundle made from other sources: its hash no longer matches, its body prints something else
    writeFileSync(bundle, `${head.replace(/"hash":"[0-9a-f]+"/, `"hash":"${'0'.repeat(64)}"`)}\nconsole.log('stale');\n`);
    const r = launch(['plan', '--design', design]);
    expect(r.stdout).toBe(viaTsx.stdout);
    expect(readFileSync(bundle, 'utf8')).toBe(text);
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
