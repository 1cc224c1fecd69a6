export * from './result';
export * from './eseries';
export * from './capacitive';
export * from './led';
export * from './relay';
export * from './pwm';
