export * from './auth.schema';
export * from './venues.schema';
