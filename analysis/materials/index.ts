export * from './schema';
export * from './indexAt';
export * from './library';
export * from './resolveMaterial';
export * from './adoptIndex';
