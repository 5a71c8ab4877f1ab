export * from './prng';
export * from './types';
export * from './synthesizeRun';
export * from './traceCsv';
export * from './shopHistory';
