export * from './Field';
export * from './FormMessage';
export * from './SubmitButton';
export * from './types';
