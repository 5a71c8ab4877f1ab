export * from './linearTrend';
export * from './indexDrift';
export * from './groupSummary';
export * from './distributions';
export * from './groupDifference';
export * from './individualsChart';
export * from './runRules';
export * from './newestPointRules';
