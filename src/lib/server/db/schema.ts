export * from './auth.schema';
export * from './venues.schema';
export * from './schedule.schema';
export * from './mail.schema';
export * from './props.schema';
export * from './scenes.schema';
export * from './runsheets.schema';
export * from './checklists.schema';
