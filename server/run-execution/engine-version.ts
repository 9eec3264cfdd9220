// Stored with every run and part of its input hash: a new engine never reuses an old result.
export const ENGINE_VERSION = 'cutline-flow 1.3';
