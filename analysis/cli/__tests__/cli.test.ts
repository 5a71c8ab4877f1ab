import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { cutPlan, designSpectrum, parseDesign } from '../../design';

const root = path.resolve(import.meta.dirname, '../../..');
const fixtures = path.join(root, 'analysis/design/__tests__/fixtures');
const tsx = path.join(root, 'node_modules/.bin/tsx');
const tmp = mkdtempSync(path.join(tmpdir(), 'fringelog-cli-'));

function run(script: 'spectrum' | 'plan', ...args: string[]) {
  const r = spawnSync(tsx, [path.join(root, `analysis/cli/${script}.ts`), ...args], { cwd: root, encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function writeTmp(name: string, text: string): string {
  const file = path.join(tmp, name);
  writeFileSync(file, text);
  return file;
}

describe('spectrum CLI (shared/FORMATS.md)', () => {
  it('prints { wavelengthNm, R, T } equal to designSpectrum, nothing on stderr', () => {
    const file = path.join(fixtures, 'ar4-visible.json');
    const r = run('spectrum', '--design', file, '--from', '450', '--to', '460', '--step', '2.5', '--angle', '20', '--pol', 's');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(['wavelengthNm', 'R', 'T']);
    expect(out.wavelengthNm).toEqual([450, 452.5, 455, 457.5, 460]);
    const expected = designSpectrum(parseDesign(JSON.parse(readFileSync(file, 'utf8'))), { fromNm: 450, toNm: 460, stepNm: 2.5, angleDeg: 20, pol: 's' });
    expect(out.R).toEqual(Array.from(expected.R));
    expect(out.T).toEqual(Array.from(expected.T));
  });

  it('defaults to 400–800 nm in 1 nm steps', () => {
    const out = JSON.parse(run('spectrum', '--design', path.join(fixtures, 'hl7-reflector.json')).stdout);
    expect(out.wavelengthNm).toHaveLength(401);
    expect(out.wavelengthNm[0]).toBe(400);
    expect(out.wavelengthNm[400]).toBe(800);
  });

  const bad: [string, string[], number, RegExp][] = [
    ['missing file', ['--design', path.join(tmp, 'none.json')], 1, /none\.json: cannot read file: no such file/],
    ['no --design', [], 2, /missing --design/],
    ['unknown flag', ['--design', 'x.json', '--colour', 'red'], 2, /Unknown option '--colour'/],
    ['non-numeric flag', ['--design', 'x.json', '--step', '1nm'], 2, /--step must be a number \(got "1nm"\)/],
    ['bad polarization', ['--design', 'x.json', '--pol', 'q'], 2, /--pol must be one of s, p, mean/],
    ['reversed range', ['--design', path.join(fixtures, 'ar4-visible.json'), '--from', '800', '--to', '400'], 1, /to \(400 nm\) must not be below from \(800 nm\)/],
  ];
  for (const [what, args, code, message] of bad) {
    it(`${what}: message on stderr, exit ${code}, nothing on stdout`, () => {
      const r = run('spectrum', ...args);
      expect(r.code).toBe(code);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/^spectrum: /);
      expect(r.stderr).toMatch(message);
    });
  }
});

describe('plan CLI (shared/FORMATS.md)', () => {
  it('prints { layers: [...] } with the FORMATS keys, equal to cutPlan', () => {
    const file = path.join(fixtures, 'hl7-reflector.json');
    const r = run('plan', '--design', file);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const expected = cutPlan(parseDesign(JSON.parse(readFileSync(file, 'utf8'))));
    expect(out.layers).toHaveLength(7);
    out.layers.forEach((l: Record<string, unknown>, i: number) => {
      for (const key of ['layer', 'wavelengthNm', 'mode', 'chip', 'turningPoints', 'startSignal', 'cutSignal', 'swingPct'] as const) {
        expect(l[key]).toEqual(expected[i][key]);
      }
    });
  });

  it('a JSON syntax error names the file, line and column', () => {
    const file = writeTmp('broken.json', '{\n  "format": "fringelog.design/1",\n  "layers": [1, 2,]\n}\n');
    const r = run('plan', '--design', file);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr.trim()).toBe(`plan: ${file}: invalid JSON at line 3, column 19: Unexpected token ']'`);
  });

  it('a schema error names the file and the key', () => {
    const json = JSON.parse(readFileSync(path.join(fixtures, 'hl7-reflector.json'), 'utf8'));
    json.layers[3].monitor.mode = 'reflect';
    const file = writeTmp('mode.json', JSON.stringify(json, null, 2));
    const r = run('plan', '--design', file);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(new RegExp(`^plan: ${file.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: layers\\[3\\]\\.monitor\\.mode: `));
  });
});
