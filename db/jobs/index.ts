export * from './analyseStoredRun';
export * from './toJsonValue';
