export * from './auth.schema';
export * from './venues.schema';
export * from './schedule.schema';
