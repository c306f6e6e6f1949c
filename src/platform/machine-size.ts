// The size of the machine a fit runs on, read from the operating system, for the estimate said
// before a fit starts (src/services fit-estimate.ts takes it as plain numbers).
import { availableParallelism, totalmem } from 'node:os';

export function machineSize(): { memoryBytes: number; cores: number } {
  return { memoryBytes: totalmem(), cores: Math.max(1, availableParallelism()) };
}
