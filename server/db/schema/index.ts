export * from './organizations';
export * from './sessions';
export * from './plans';
export * from './audit-events';
