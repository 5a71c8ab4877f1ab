export * from './linearTrend';
export * from './indexDrift';
