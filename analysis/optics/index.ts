export * from './complex';
export * from './tilt';
export * from './matrix';
export * from './assembly';
export * from './coherent';
export * from './incoherent';
export * from './stackResponse';
export * from './growingLayer';
