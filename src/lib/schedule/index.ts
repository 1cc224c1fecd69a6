export * from './crew';
export * from './ics';
export * from './season';
export * from './wall-time';
