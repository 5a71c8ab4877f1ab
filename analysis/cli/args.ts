import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { DesignFormatError } from '../design/DesignFormatError';
import { parseDesign, type Design } from '../design/parseDesign';
import { jsonErrorPosition, lineColumn } from './jsonErrorPosition';

/** A bad command line (exit code 2). */
export class CliUsageError extends Error {
  readonly exitCode = 2;
}

/** A bad input file or value (exit code 1). */
export class CliInputError extends Error {
  readonly exitCode = 1;
}

/** Parses `--name value` flags (all string-valued); unknown flags and positionals are usage errors. */
export function parseFlags<K extends string>(argv: readonly string[], names: readonly K[], usage: string): Partial<Record<K, string>> {
  const options = Object.fromEntries(names.map((n) => [n, { type: 'string' as const }]));
  try {
    const { values } = parseArgs({ args: [...argv], options, strict: true, allowPositionals: false });
    return values as Partial<Record<K, string>>;
  } catch (e) {
    throw new CliUsageError(`${(e as Error).message.replace(/\. To specify a positional argument.*$/s, '')}\nusage: ${usage}`);
  }
}

export function requireFlag<K extends string>(values: Partial<Record<K, string>>, name: K, usage: string): string {
  const v = values[name];
  if (v === undefined || v === '') throw new CliUsageError(`missing --${name}\nusage: ${usage}`);
  return v;
}

/** A numeric flag: the whole string must be a finite number. */
export function numberFlag<K extends string>(values: Partial<Record<K, string>>, name: K, fallback: number): number {
  const raw = values[name];
  if (raw === undefined) return fallback;
  const v = raw.trim() === '' ? Number.NaN : Number(raw);
  if (!Number.isFinite(v)) throw new CliUsageError(`--${name} must be a number (got "${raw}")`);
  return v;
}

export function choiceFlag<K extends string, C extends string>(values: Partial<Record<K, string>>, name: K, choices: readonly C[], fallback: C): C {
  const raw = values[name];
  if (raw === undefined) return fallback;
  if (!(choices as readonly string[]).includes(raw)) throw new CliUsageError(`--${name} must be one of ${choices.join(', ')} (got "${raw}")`);
  return raw as C;
}

/** Reads and parses a JSON file; syntax errors name the file, line and column. */
export function readJsonFile(path: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
    throw new CliInputError(`${path}: cannot read file: ${why}`);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  try {
    return JSON.parse(text);
  } catch (e) {
    const v8 = (e as Error).message;
    const m = /at position (\d+)/.exec(v8);
    const offset = m ? Number(m[1]) : jsonErrorPosition(text);
    const reason = v8.replace(/ in JSON at position \d+.*$/s, '').replace(/, (\.\.\.)?".*" is not valid JSON$/s, '');
    if (offset < 0) throw new CliInputError(`${path}: invalid JSON: ${reason}`);
    const { line, column } = lineColumn(text, offset);
    throw new CliInputError(`${path}: invalid JSON at line ${line}, column ${column}: ${reason}`);
  }
}

/** Reads a design file; any fault becomes a CliInputError naming the file and the key or line. */
export function loadDesignFile(path: string): Design {
  const json = readJsonFile(path);
  try {
    return parseDesign(json, path);
  } catch (e) {
    if (e instanceof DesignFormatError) throw new CliInputError(e.message);
    throw e;
  }
}

/** Float64Arrays as plain arrays, so JSON.stringify writes numbers, not index maps. */
function replacer(_key: string, value: unknown): unknown {
  return value instanceof Float64Array ? Array.from(value) : value;
}

/**
 * Runs a command: its result is written to stdout as one JSON document only once complete;
 * errors go to stderr as "name: message" with exit code 2 (usage) or 1 (input, other).
 */
export async function runCli(name: string, main: (argv: string[]) => unknown): Promise<void> {
  try {
    const result = await main(process.argv.slice(2));
    process.stdout.write(`${JSON.stringify(result, replacer)}\n`);
    process.exitCode = 0;
  } catch (e) {
    const err = e as Error & { exitCode?: number };
    const known = err instanceof CliUsageError || err instanceof CliInputError || err instanceof RangeError;
    process.stderr.write(`${name}: ${known ? err.message : (err.stack ?? String(err))}\n`);
    process.exitCode = err.exitCode ?? 1;
  }
}
