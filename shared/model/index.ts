// The capacity model: class defaults with their sources, factors, departure curves, and the
// translation of plan data into the flow engine's problem.
export * from './hcm';
export * from './capacity-defaults';
export * from './capacity-factors';
export * from './departure-curves';
export * from './vehicles';
export * from './zone-defaults';
export * from './build-evacuation-problem';
export * from './source-texts';
