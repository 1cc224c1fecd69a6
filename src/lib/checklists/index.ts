export * from './evaluate';
export * from './generate';
