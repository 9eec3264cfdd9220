// Optimisation over evacuation problems: what is best, not only what if. Pure computation that
// calls the flow engine only through its public index (shared/flow). See README.md.
export * from './caution';
export * from './linear-program';
export * from './problem-tools';
export * from './road-pairs';
export * from './bounded-augment';
export * from './flow-paths';
export * from './implicit-plan';
export * from './best-contraflow';
export * from './closure-impact';
export * from './best-lanes';
export * from './release-order';
export * from './zone-routes';
