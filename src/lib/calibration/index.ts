// The capture reader needs Node streams; import it from './capture' on the server.
export * from './erfc';
export * from './stats';
export * from './student-t';
export * from './calibrate';
export * from './baseline-trend';
