// Runs a command's bundle (db/local/cli.mjs buildBundle) with V8's code cache, in the launcher's
// thread and in the threads `analyze` starts on THREAD_ENTRY (this module). Kept apart from the
// launcher so that a thread loads only what running a bundle takes, and never the launcher's own
// start (its hashing and building); the launcher is imported only by a thread told no bundle.
import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import vm from 'node:vm';
import { isMainThread, workerData } from 'node:worker_threads';

/** The entry of the threads a bundle starts on itself (its import.meta.url). */
export const THREAD_ENTRY = import.meta.url;

/** A short fingerprint of a string (FNV-1a, 32 bits, hex; Fowler, Noll and Vo, common practice): here Node's flags. */
function fnv1a(text) {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 0x01000193);
  return (h >>> 0).toString(16).padStart(8, '0');
}

/**
 * Runs a bundle (buildBundle's CommonJS script) in this thread through node:vm with V8's code
 * cache: the bytecode of every function the last run compiled, kept beside the bundle, so a run
 * neither parses the 1.4 MB script nor compiles its functions again. Measured on the bench case
 (tests/bench/analyzeProcess.ts, 10 alternated pairs against the ES module loaded by import(),
 * its thread on the module too): wall 0.945×, CPU 0.939×; on a one-layer trace, wall 0.88×. The
 * cache is made after a run that had none (or whose cache V8 refused) and ended well, in the main
 * thread only, written whole and renamed into place. Its name carries the bundle's hash and Node's flags (V8 refuses a cache made under other
 * flags, and checks only the source's length, not its text: a cache is never read for another
 * bundle). The bundle's import.meta.url (the thread's entry in analyze) is this module's:
 * a thread started on it runs the same bundle (below).
 */
export function runBundle(bundle, writeCache) {
  const code = fs.readFileSync(bundle.file, 'utf8');
  const flags = fnv1a(process.execArgv.join('\0'));
  const cacheFile = `${bundle.file}.${bundle.hash.slice(0, 16)}.${flags}.v8cache`;
  let cachedData;
  try {
    cachedData = fs.readFileSync(cacheFile);
  } catch {
    cachedData = undefined;
  }
  // (the parameters of Node's own CommonJS wrapper, and the entry URL)
  const script = new vm.Script(`(function (exports, require, module, __filename, __dirname, __fringelogEntryUrl) {${code}\n})`, {
    filename: bundle.file, ...(cachedData ? { cachedData } : {}),
  });
  if (writeCache && (!cachedData || script.cachedDataRejected)) {
    // (after a run that ended well: one stopped early by bad input compiled little of the bundle)
    process.once('exit', (code) => {
      if (code !== 0) return;
      try {
        const tmp = `${cacheFile}.${process.pid}.tmp`;
        fs.writeFileSync(tmp, script.createCachedData());
        fs.renameSync(tmp, cacheFile);
      } catch {
        // a cache that cannot be written is made again next time
      }
    });
  }
  const module = { exports: {} };
  script.runInThisContext()(module.exports, createRequire(bundle.file), module, bundle.file, path.dirname(bundle.file), THREAD_ENTRY);
}

if (!isMainThread && workerData?.role === 'fringelog-layer-spectra') {
  // a thread analyze started on its entry: the bundle the launcher passed (cli.mjs
  // startEarlyThread), else the current one (the command's own thread, when the early one failed)
  // (not awaited at the top level: cli.mjs imports this module, which would wait on itself)
  const bundle = workerData.bundle ? Promise.resolve(workerData.bundle) : import('./cli.mjs').then((m) => m.freshBundle('analyze'));
  void bundle.then((b) => b && runBundle(b, false));
}
