export * from './checks';
export * from './timeline';
export * from './types';
