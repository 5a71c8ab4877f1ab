// `npm run NAME` for the command lines of analysis/cli (spectrum, plan, analyze). Plain Node:
// runs analysis/cli/NAME.ts as one script bundled by tsx's own esbuild, kept in
// node_modules/.cache/fringelog-cli/ and rebuilt whenever any of its source files (or
// tsconfig.json) changed, so a fresh clone and an edited tree work alike. Starting the bundle
// costs about a tenth of starting tsx, which compiles every file on each run. Packages go into
// the bundle too (their files are among its inputs): loading zod's hundred modules from
// node_modules one by one cost each thread of `analyze` about 0.07 s of CPU more than reading them
// in the one file (10 alternated starts each). The bundle is a CommonJS script run through
// node:vm with V8's code cache (cliRun.mjs runBundle). When no bundle can be built or written, the
// command runs through tsx in this process instead.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import v8 from 'node:v8';
import { isMainThread, Worker } from 'node:worker_threads';
import { runBundle, THREAD_ENTRY } from './cliRun.mjs';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const COMMANDS = ['spectrum', 'plan', 'analyze'];
const HEADER = '// fringelog-cli ';
// Part of every bundle's key: a change to how bundles are built invalidates the old ones.
const BUILD = 'cjs-node20-packages-bundled-codecache-1';

/** Where the bundles live (FRINGELOG_CLI_CACHE overrides it, e.g. for a test: a folder inside the project, where the bundle finds node_modules). */
export function cacheDir() {
  return process.env.FRINGELOG_CLI_CACHE || path.join(root, 'node_modules', '.cache', 'fringelog-cli');
}

/** One hash over the build settings and every input's path and bytes; null when one is missing. */
function inputsHash(inputs) {
  const h = createHash('sha256').update(BUILD);
  for (const rel of inputs) {
    let bytes;
    try {
      bytes = fs.readFileSync(path.join(root, rel));
    } catch {
      return null;
    }
    h.update(`\0${rel}\0${bytes.length}\0`).update(bytes);
  }
  return h.digest('hex');
}

/** The bundle (its path, and the hash its first line records) when it exists and matches its sources, else null. */
export function freshBundle(name, dir = cacheDir()) {
  const file = path.join(dir, `${name}.cjs`);
  let head;
  try {
    const fd = fs.openSync(file, 'r');
    try {
      const buf = Buffer.alloc(64 * 1024);
      head = buf.toString('utf8', 0, fs.readSync(fd, buf, 0, buf.length, 0));
    } finally {
      fs.closeSync(fd);
    }
  } catch {
    return null;
  }
  const nl = head.indexOf('\n');
  if (!head.startsWith(HEADER) || nl < 0) return null;
  let key;
  try {
    key = JSON.parse(head.slice(HEADER.length, nl));
  } catch {
    return null;
  }
  return Array.isArray(key.inputs) && key.hash === inputsHash(key.inputs) ? { file, hash: key.hash } : null;
}

/** Builds analysis/cli/NAME.ts into the cache (written whole, then renamed into place); returns its path and hash. */
export async function buildBundle(name, dir = cacheDir()) {
  // tsx's own esbuild: tsx is a dependency, so it is there wherever `npm run` works.
  const requireFromTsx = createRequire(createRequire(path.join(root, 'package.json')).resolve('tsx/package.json'));
  const esbuild = requireFromTsx('esbuild');
  const result = await esbuild.build({
    absWorkingDir: root,
    entryPoints: [path.join('analysis', 'cli', `${name}.ts`)],
    bundle: true,
    platform: 'node',
    // a script, not a module: node:vm compiles a script with a code cache (runBundle), a module only
    // behind a flag. import.meta.url (the thread's entry in analyze) is cliRun.mjs's (runBundle).
    format: 'cjs',
    target: 'node20',
    define: { 'import.meta.url': '__fringelogEntryUrl' },
    metafile: true,
    write: false,
    logLevel: 'silent',
  });
  const inputs = [...Object.keys(result.metafile.inputs), 'tsconfig.json'].sort();
  const hash = inputsHash(inputs);
  if (hash === null) throw new Error('a source file vanished during the build');
  const file = path.join(dir, `${name}.cjs`);
  fs.mkdirSync(dir, { recursive: true });
  const tmp = `${file}.${process.pid}.tmp`;
  fs.writeFileSync(tmp, `${HEADER}${JSON.stringify({ hash, inputs })}\n${result.outputFiles[0].text}`);
  fs.renameSync(tmp, file);
  // the code caches of the bundles it replaces (runBundle), and a bundle of the earlier ES module kind
  for (const f of fs.readdirSync(dir)) {
    if ((f.startsWith(`${name}.cjs.`) && f.endsWith('.v8cache') && !f.startsWith(`${name}.cjs.${hash.slice(0, 16)}.`)) || f === `${name}.mjs`) fs.rmSync(path.join(dir, f), { force: true });
  }
  return { file, hash };
}

/**
 * analyze: its second thread (analysis/cli/spectrumThread.ts, which takes it over from
 * globalThis[EARLY_THREAD]) started here on the bundle's thread entry (cliRun.mjs, told which
 * bundle in its workerData), so that thread loads the bundle while this one does, not after:
 * started by the command, it was ready about 0.13 s into the process, and until then this thread
 * read the trace alone. The role and the claims' length are the ones
 * spectrumThread.ts gives its threads (it takes over only a thread that has them). Unreferenced: a
 * command that stops before taking it over does not wait for it. One core: no second thread.
 */
const EARLY_THREAD = Symbol.for('fringelog.cli.earlyThread');
function startEarlyThread(bundle) {
  if (availableParallelism() <= 1) return;
  try {
    const claims = new Int32Array(new SharedArrayBuffer(4 * (1 << 14)));
    const early = { entry: THREAD_ENTRY, worker: null, claims, failed: false };
    early.worker = new Worker(new URL(early.entry), { workerData: { role: 'fringelog-layer-spectra', claims, bundle } });
    early.worker.unref();
    // until taken over: a thread that fails is noted, for the command to start its own
    const failed = () => (early.failed = true);
    early.worker.on('error', failed);
    early.worker.on('exit', failed);
    globalThis[EARLY_THREAD] = early;
  } catch {
    // the command starts its own
  }
}

async function main() {
  const name = process.argv[2];
  if (!COMMANDS.includes(name)) {
    process.stderr.write(`usage: node db/local/cli.mjs ${COMMANDS.join('|')} [flags]\n`);
    process.exit(2);
  }
  // The command reads its flags from process.argv.slice(2), as when tsx runs it.
  process.argv.splice(2, 1);
  // analyze: V8's optimising compiler inlines at most 120 bytes of bytecode into a function, not
  // 920. Its compiles run on background threads, about 1 s of CPU in the bench case (40 layers,
  // 8·10⁵ samples), the functions compiled on each of the command's two threads; on two cores they
  // competed with those threads. Capped (set before any code is optimised; the second thread's
  // engine shares the flags): CPU 2.85 → 2.61 s, wall −9 % (paired, 10 runs each), the same output
  // (inlining does not change a float operation). Without inlining at all, no faster still.
  // Two of its optimisations left out as well, loop peeling and escape analysis: compiling is
  // still much of the command's time (V8's --trace-opt: compile jobs of 1.6 s in all by their own
  // clocks, on the two threads), and their code ran no faster here than they cost to make: wall
  // 0.957×, CPU 0.934× (8 alternated pairs; 0.955× and 0.938× in 14 more), the same output byte
  // for byte. Tried with them, no gain: no load or store elimination, no loop rotation or
  // allocation folding, the mid-tier register allocator, a cap of 60 or 200.
  if (name === 'analyze') {
    v8.setFlagsFromString('--max-inlined-bytecode-size-cumulative=120');
    v8.setFlagsFromString('--no-turbo-loop-peeling');
    v8.setFlagsFromString('--no-turbo-escape');
  }
  let bundle = freshBundle(name);
  if (!bundle) {
    try {
      bundle = await buildBundle(name);
    } catch (e) {
      if (process.env.FRINGELOG_CLI_DEBUG) process.stderr.write(`cli: no bundle (${e.message}); running through tsx\n`);
      const { register } = await import('tsx/esm/api');
      register();
      await import(pathToFileURL(path.join(root, 'analysis', 'cli', `${name}.ts`)).href);
      return;
    }
  }
  if (name === 'analyze') startEarlyThread(bundle);
  runBundle(bundle, true);
}

// (main thread only: cliRun.mjs imports this module in a thread that was not told its bundle)
if (isMainThread && process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) await main();
