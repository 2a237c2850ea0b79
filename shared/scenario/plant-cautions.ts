import type { Scenario } from './scenario-schema';

/**
 * Why a scenario's joint is unusual, in words: negative stiffness or damping make the plant
 * unstable on its own (a load pushing away from rest, such as gravity on a link above horizontal
 * linearized there; a drive model feeding energy in). Allowed, because such joints are real and
 * a loop can hold them — but every view of the scenario should say so. Empty for a passive joint.
 * @example plantCautions({ joint: { inertia: 1, damping: 0, stiffness: -2, gearRatio: 1 } }) // ["negative stiffness …"]
 */
export function plantCautions(scenario: Pick<Scenario, 'joint'>): string[] {
  const { damping: b, stiffness: k } = scenario.joint;
  const cautions: string[] = [];
  if (k < 0) cautions.push(`negative stiffness (k = ${k} N·m/rad): a load pushes the joint away from rest, so the open-loop plant is unstable and only the loop can hold it`);
  if (b < 0) cautions.push(`negative damping (b = ${b} N·m·s/rad): the joint gains energy as it moves, so the open-loop plant is unstable and only the loop can hold it`);
  return cautions;
}
