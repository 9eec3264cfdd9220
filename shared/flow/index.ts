// The flow engine's public surface. Everything else in this folder is internal.
export * from './capacity';
export * from './errors';
export * from './flow-network';
export * from './flow-state';
export { emptyStats, type MaxFlowStats } from './solve-context';
export * from './min-cut';
export * from './max-flow';
export * from './verify';
export * from './evacuation-problem';
export * from './release-schedule';
export * from './road-timing';
export * from './route-timing';
export * from './steady-state';
export * from './time-expanded';
export * from './dimacs';
export { createBoykovKolmogorov, type BoykovKolmogorovSolver } from './boykov-kolmogorov';
export { createIncrementalBfs, type IncrementalSolver, type IncrementalSolverSnapshot } from './incremental-bfs';
export * from './evacuation-curve';
export * from './expanded-usage';
export * from './bottlenecks';
export * from './fixes';
export * from './solve-evacuation';
export { AUTO_HANDOVER_AUGMENTATIONS_PER_ARC, autoAugmentationLimit, incrementalBfsThenPushRelabel } from './handover';
// The time-expanded network without its copies written out, for callers that solve over time at
// a size the explicit layout would not fit (the searches of shared/plan-optimization).
export { ImplicitExpandedNetwork, expandImplicitly } from './implicit-expanded';
export { computeImplicitCurve, type ImplicitCurveOptions } from './implicit-curve';
export { ImplicitIncrementalBfs, type ResidualChangeNote } from './implicit-incremental-bfs';
export { implicitArrivalsByStep, implicitRoadUsage } from './implicit-readout';
