export * from './design';
export * from './options';
export * from './simulateChamberRun';
export * from './traceFiles';
export { chamberRng, type ChamberRng } from './rng';
