// `npm run bench`: each section prints its own figures; a benchmark is never a timed test.
// Each section's modules are loaded when it starts, not all at once: under tsx, any CommonJS
// package loaded before them (ml-matrix, pg, busboy alike) slowed the optics section's monitor
// curve from 47 to 54 ms, which the same code bundled and run by plain Node never shows (41.7 ms
// with ml-matrix loaded or not): the loader's cost, not the optics'.
export {};

const sections = ['optics', 'analysis', 'analyzeProcess', 'upload', 'compare', 'runPage'] as const;
for (const name of sections) {
  const { run } = (await import(`./${name}.ts`)) as { run: () => Promise<void> };
  await run();
}
