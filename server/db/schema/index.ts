export * from './organizations';
export * from './sessions';
export * from './plans';
export * from './audit-events';
export * from './network';
export * from './runs';
export * from './settings';
export * from './briefings';
