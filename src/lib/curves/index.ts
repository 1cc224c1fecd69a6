export * from './lightness';
export * from './curve';
export * from './level-table';
export * from './flicker';
export * from './export';
