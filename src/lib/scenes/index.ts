export * from './checks';
export * from './timeline';
export * from './types';
export * from './response';
export * from './preview';
export * from './analysis';
