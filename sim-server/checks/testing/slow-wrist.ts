import { demoScenarioDocument } from '../../testing/test-server';

/**
 * The wrist demo with a sampled 1 ms loop behind a 1 N·m limit over `horizon` seconds (demo data,
 * invented numbers): every controller sample restarts the integrator and the linear range
 * bisects, so its checks hold a worker for about 0.5 s per second of horizon on a quiet core
 * (2.3 s for 5 s, measured in a probe) and longer on a busy one. The checks tests and the checks
 * benchmark load the pool with it.
 */
export function slowWrist(horizon: number): Record<string, unknown> {
  const doc = demoScenarioDocument('wrist-pitch-step.json') as { controller: Record<string, unknown> };
  return { ...doc, name: `Sampled wrist over ${horizon} s`, horizon, controller: { ...doc.controller, samplePeriod: 0.001 }, nonlinear: { torqueLimit: 1 } };
}
