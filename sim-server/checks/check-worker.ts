import { runBatchTask, type BatchKind, type BatchResults, type BatchTask } from './batch-task';

/**
 * The worker thread's task (piscina calls the default export): one batch task the route has
 * already parsed — the checks, a measured sweep, an operating range — answered as plain,
 * structured-clonable data.
 */
export default function runTask(task: BatchTask): BatchResults[BatchKind] {
  return runBatchTask(task);
}
