export * from './analyseStoredRun';
export * from './toJsonValue';
export * from './seriesOverview';
