import type { BatchTask } from '../batch-task';

/** A worker task that throws, as a bug in the checks would: the pool must answer 500 and carry on. */
export default function failingCheck(task: BatchTask): never {
  throw new Error(`failing check worker refused "${task.scenario.name}" on purpose`);
}
