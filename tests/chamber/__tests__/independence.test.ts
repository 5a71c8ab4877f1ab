import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const dir = path.resolve(import.meta.dirname, '..');

describe('the chamber simulator shares no code with analysis/', () => {
  it('no simulator file imports from analysis/ (only harness/ and the tests do)', () => {
    const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));
    expect(files).toContain('simulateChamberRun.ts');
    for (const f of files) {
      const imports = [...readFileSync(path.join(dir, f), 'utf8').matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]);
      for (const spec of imports) expect(spec, `${f} imports ${spec}`).toMatch(/^\.\/[\w]+$/);
    }
  });
});
