export * from './auth.schema';
export * from './venues.schema';
export * from './mail.schema';
