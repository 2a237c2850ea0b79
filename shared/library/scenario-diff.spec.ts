import { describe, expect, it } from 'vitest';
import { parseScenario } from '../scenario/parse-scenario';
import type { Scenario } from '../scenario/scenario-schema';
import { diffScenarios } from './scenario-diff';

// Invented demo values: the diff compares documents, not physics.
function scenario(overrides: Record<string, unknown> = {}): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Shoulder step',
    joint: { inertia: 0.2, damping: 0.05, stiffness: 0 },
    controller: { mode: 'pid', kp: 8, ki: 1, kd: 0.4 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
    horizon: 3,
    ...overrides,
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  return parsed.value;
}

describe('diffScenarios', () => {
  it('finds nothing between a scenario and itself', () => {
    expect(diffScenarios(scenario(), scenario())).toEqual([]);
  });

  it('reports changed joint, controller and limit parameters with both values', () => {
    const a = scenario();
    const b = scenario({
      joint: { inertia: 0.25, damping: 0.05, stiffness: 0 },
      controller: { mode: 'pid', kp: 12, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
      limits: { overshootPercent: 5 },
    });
    expect(diffScenarios(a, b)).toEqual([
      { section: 'joint', path: 'joint.inertia', kind: 'changed', before: 0.2, after: 0.25 },
      { section: 'controller', path: 'controller.derivativeOn', kind: 'changed', before: 'error', after: 'measurement' },
      { section: 'controller', path: 'controller.kp', kind: 'changed', before: 8, after: 12 },
      { section: 'limits', path: 'limits.overshootPercent', kind: 'changed', before: null, after: 5 },
    ]);
  });

  it('reports input terms added and removed by position, numerically ordered', () => {
    const terms = Array.from({ length: 11 }, (_, i) => ({ channel: 'torque', shape: 'step', amplitude: i + 1, delay: i }));
    const a = scenario({ inputs: terms.slice(0, 9) });
    const b = scenario({ inputs: terms });
    const changes = diffScenarios(a, b);
    expect(changes.every((c) => c.section === 'inputs' && c.kind === 'added' && c.before === null)).toBe(true);
    expect(changes.map((c) => c.path.split('.')[1])).toEqual([...Array(4).fill('9'), ...Array(4).fill('10')]);
    expect(diffScenarios(b, a).every((c) => c.kind === 'removed' && c.after === null)).toBe(true);
  });

  it('sees a sign change of zero and a renamed scenario', () => {
    const changes = diffScenarios(scenario({ initial: { angle: 0, velocity: 0 } }), scenario({ name: 'Elbow step', initial: { angle: -0, velocity: 0 } }));
    expect(changes).toEqual([
      { section: 'name', path: 'name', kind: 'changed', before: 'Shoulder step', after: 'Elbow step' },
      { section: 'initial', path: 'initial.angle', kind: 'changed', before: 0, after: -0 },
    ]);
  });
});
