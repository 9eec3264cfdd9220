// Stored with every run and part of its input hash: a new engine never reuses an old result.
// 1.4: the result times the routes its plan drives (routeTiming.plannedRoutes).
export const ENGINE_VERSION = 'cutline-flow 1.4';
