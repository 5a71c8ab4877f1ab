export * from './analyseStoredRun';
export * from './analysisSettings';
export * from './runAnalysisJob';
export * from './toJsonValue';
export * from './seriesOverview';
export * from './queueAnalysis';
