export * from './audit';
export * from './chambers';
export * from './health';
export * from './mail';
export * from './signInAttempts';
export * from './tokens';
export * from './users';
