import type { Scenario } from '../../../shared/scenario/scenario-schema';

/** A worker task that throws, as a bug in the checks would: the pool must answer 500 and carry on. */
export default function failingCheck(scenario: Scenario): never {
  throw new Error(`failing check worker refused "${scenario.name}" on purpose`);
}
