import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../../..');
const samples = path.join(root, 'sample-traces');
const tsx = path.join(root, 'node_modules/.bin/tsx');
const tmp = mkdtempSync(path.join(tmpdir(), 'fringelog-analyze-'));

function analyze(...args: string[]) {
  return analyzeWith({}, ...args);
}

function analyzeWith(env: Record<string, string>, ...args: string[]) {
  const r = spawnSync(tsx, [path.join(root, 'analysis/cli/analyze.ts'), ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, ...env }, maxBuffer: 64 * 2 ** 20 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function writeTmp(name: string, text: string): string {
  const file = path.join(tmp, name);
  writeFileSync(file, text);
  return file;
}

const design = path.join(samples, 'bbar4-visible.json');
const trace = path.join(samples, 'bay2-bb4-run0587.csv');
const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

describe('analyze CLI (shared/FORMATS.md)', () => {
  it('prints fringelog.analysis/1 with the FORMATS layer keys, close to the known truth', () => {
    const r = analyze('--design', design, '--trace', trace, '--mode', 'refit');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out).slice(0, 3)).toEqual(['format', 'layers', 'warnings']);
    expect(out.format).toBe('fringelog.analysis/1');
    expect(Array.isArray(out.warnings)).toBe(true);
    const truth = JSON.parse(readFileSync(trace.replace(/\.csv$/, '.truth.json'), 'utf8'));
    expect(out.layers).toHaveLength(4);
    out.layers.forEach((l: Record<string, number | string>, i: number) => {
      for (const key of ['layer', 'material', 'thicknessNm', 'thicknessSigmaNm', 'index', 'indexSigma', 'rateNmPerS', 'cutErrorQwotPct', 'residualRms']) {
        expect(l, key).toHaveProperty(key);
      }
      expect(l.layer).toBe(i + 1);
      expect(typeof l.thicknessNm).toBe('number');
      const t = truth.layers[i];
      expect(Math.abs((l.index as number) * (l.thicknessNm as number) / (t.index * t.thicknessNm) - 1)).toBeLessThan(0.01);
      // The trace carries the growth after the cut and the level-cut reaction time of a real chamber:
      // issue 7's target there is 0.7 % QWOT, and the truth within the reported 3σ.
      const cutMiss = Math.abs((l.cutErrorQwotPct as number) - t.cutErrorQwotPct);
      expect(cutMiss).toBeLessThan(0.7);
      expect(cutMiss).toBeLessThan(3 * (l.cutErrorSigmaQwotPct as number));
    });
    expect(out.spectrum.wavelengthNm[0]).toBe(400);
  });

  it('defaults to sequential mode', () => {
    const out = JSON.parse(analyze('--design', path.join(samples, 'ar1-mgf2-crown.json'), '--trace', path.join(samples, 'bay1-ar1-run0412.csv')).stdout);
    expect(out.mode).toBe('sequential');
    expect(out.layers).toHaveLength(1);
  });

  it('a trace fault names the file, the line and the column; nothing on stdout', () => {
    const text = readFileSync(trace, 'utf8').split('\n');
    const header = text.findIndex((l) => l.startsWith('time_s'));
    text[header + 40] = text[header + 40].replace(/^([^,]*),[^,]*/, '$1,abc');
    const file = writeTmp('bad-value.csv', text.join('\n'));
    const r = analyze('--design', design, '--trace', file);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(new RegExp(`^analyze: ${escape(file)} line ${header + 41}, column "signal": `));
  });

  it('a layer the design does not have is an error naming its line', () => {
    const file = writeTmp('layer9.csv', '# chamber: Bay 2 IAD\ntime_s,signal,layer\n0,0.9,0\n0.1,0.9,9\n');
    const r = analyze('--design', design, '--trace', file);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(new RegExp(`^analyze: ${escape(file)} line 4, column "layer": `));
  });

  const bad: [string, string[], number, RegExp][] = [
    ['missing trace file', ['--design', design, '--trace', path.join(tmp, 'none.csv')], 1, /none\.csv: cannot read file: no such file/],
    ['missing --trace', ['--design', design], 2, /missing --trace/],
    ['bad mode', ['--design', design, '--trace', trace, '--mode', 'fast'], 2, /--mode must be one of sequential, refit \(got "fast"\)/],
    ['missing design file', ['--design', path.join(tmp, 'none.json'), '--trace', trace], 1, /none\.json: cannot read file: no such file/],
  ];
  for (const [what, args, code, message] of bad) {
    it(`${what}: message on stderr, exit ${code}`, () => {
      const r = analyze(...args);
      expect(r.code).toBe(code);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/^analyze: /);
      expect(r.stderr).toMatch(message);
    });
  }

  it('a layer column of zeros is a failed analysis naming the layers: message on stderr, exit 1', () => {
    const rows = readFileSync(trace, 'utf8').split('\n').map((l) => (/^[\d.]+,/.test(l) ? l.replace(/^([^,]*,[^,]*),\d+/, '$1,0') : l));
    const file = writeTmp('zeros.csv', rows.join('\n'));
    const r = analyze('--design', design, '--trace', file);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(new RegExp(`^analyze: ${escape(file)}: 4 of the design's 4 layers would get no result: layer 1 \\(H\\): the trace's layer column never says 1; layer 2 \\(L\\)`));
  });

  it('two single rows marked paused inside a layer: analysed, the layer joined from its runs', () => {
    const rows = readFileSync(trace, 'utf8').split('\n');
    const inLayer3 = rows.flatMap((l, i) => (/^[\d.]+,[^,]*,3,/.test(l) ? [i] : []));
    const mid = inLayer3[inLayer3.length >> 1];
    for (const i of [mid, mid + 2]) rows[i] = rows[i].replace(/^([^,]*,[^,]*),3,/, '$1,0,');
    const r = analyze('--design', design, '--trace', writeTmp('paused.csv', rows.join('\n')));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const l3 = JSON.parse(r.stdout).layers[2];
    expect(l3.warnings).toContain('the layer was deposited in 3 runs; the pauses are left out of its time base');
  });

  it('two million bare "#" lines: warnings capped (some listed, then a count), memory bounded by the samples', () => {
    const file = writeTmp('hashes.csv', '#\n'.repeat(2_000_000) + readFileSync(trace, 'utf8'));
    // 160 MB of heap is far below what one message per line took (about 1 GB)
    const r = analyzeWith({ NODE_OPTIONS: '--max-old-space-size=160' }, '--design', design, '--trace', file);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const malformed = out.warnings.filter((w: string) => w.includes('metadata line is not "# key: value"'));
    expect(malformed).toHaveLength(20);
    expect(out.warnings).toContain('1999980 more "metadata_malformed" warnings not listed (2000000 in all, the first at line 1)');
    expect(r.stdout.length).toBeLessThan(2e6);
  });
});
