// Public surface of the parallel sampler (AD-LDA on worker threads).
export { createParallelSampler, type ParallelOptions, type ParallelSamplerFactory } from './parallel-sampler.js';
export { partitionGroups } from './partition.js';
