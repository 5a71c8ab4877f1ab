export * from './linearTrend';
export * from './indexDrift';
export * from './correlatedNoise';
