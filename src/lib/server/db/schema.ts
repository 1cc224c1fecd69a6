export * from './auth.schema';
export * from './venues.schema';
export * from './props.schema';
