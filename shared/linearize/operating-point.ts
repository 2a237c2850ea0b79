import { resolveNonlinear, type NonlinearBlock } from '../scenario/nonlinear-schema';
import { catalogueEntry, rangeViolation } from '../scenario/parameter-catalogue';
import { parseScenario } from '../scenario/parse-scenario';
import type { InputTerm, Scenario } from '../scenario/scenario-schema';
import type { FieldError, Parsed } from '../validation/field-errors';

/**
 * How the torque that holds the joint at θ0 against gravity and its spring is supplied:
 * `feed-forward` — the drive adds it (gravity compensation), so θ0 is an equilibrium and the
 * linear model carries no constant term; `disturbance` — nothing supplies it, so it acts on the
 * linear model as a constant torque from t = 0 that the loop must hold itself.
 */
export type HoldingMode = 'feed-forward' | 'disturbance';

export interface OperatingPointRequest {
  /** θ0, rad, the joint angle the model is linearized about. */
  angle: number;
  holding: HoldingMode;
}

/** The pair a comparison needs: the nonlinear joint and its linear model, both about θ0. */
export interface LinearizedJoint {
  /** The linear model, in angles measured from θ0 (δ = θ − θ0); its closed form is exact for it. */
  linear: Scenario;
  /** The same joint with its nonlinear effects, in the same coordinates and with the same holding. */
  nonlinear: Scenario;
  /** The scenario's own inputs, the moves from θ0 (both scenarios carry them first, then their constant torque, if any). */
  moves: InputTerm[];
  /** k + m·g·l·cos(θ0 + offset), N·m/rad. */
  effectiveStiffness: number;
  /** k·θ0 + m·g·l·sin(θ0 + offset), N·m: what holds the joint still at θ0. */
  holdingTorque: number;
  notes: string[];
}

/** An angle brought into (−π, π], so a shifted gravity offset stays a plain angle. */
function wrapAngle(x: number): number {
  const r = x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
  return r === -Math.PI ? Math.PI : r;
}

const step = (amplitude: number): InputTerm => ({ channel: 'torque', shape: 'step', amplitude, delay: 0 });

/**
 * The linear model of a gravity-loaded joint about an operating angle θ0, as a scenario. With
 * δ = θ − θ0 the load −m·g·l·sin(θ + φ) expands to −m·g·l·sin φ0 − m·g·l·cos φ0 · δ + O(δ²),
 * φ0 = θ0 + φ, so the linear joint has stiffness k + m·g·l·cos φ0 and the constant torque
 * −(k·θ0 + m·g·l·sin φ0), held by the feed-forward or left as a disturbance (first-order Taylor
 * expansion about an equilibrium; common practice). Above horizontal (cos φ0 < 0) the effective
 * stiffness can be negative: an unstable plant the loop must hold.
 *
 * Both scenarios keep the scenario's controller and inputs, read as moves from θ0 (a reference
 * step of 0.1 is 0.1 rad from θ0), start at rest at θ0, and carry the holding torque the same way;
 * the nonlinear one is the twin's joint itself with its gravity offset shifted by θ0. The linear
 * one leaves gravity and friction out (friction has no linear model) and says so.
 */
export function linearizeAbout(scenario: Scenario, request: OperatingPointRequest): Parsed<LinearizedJoint> {
  const errors: FieldError[] = [];
  const bad = rangeViolation(catalogueEntry('initial.angle'), request.angle);
  if (bad) errors.push({ field: 'angle', message: bad.replace(/^angle/, 'the operating angle') });
  if (request.holding !== 'feed-forward' && request.holding !== 'disturbance') errors.push({ field: 'holding', message: 'must be "feed-forward" or "disturbance"' });
  const gravity = scenario.nonlinear?.gravity ?? null;
  if (!gravity) errors.push({ field: 'nonlinear.gravity', message: 'the scenario has no gravity load: its joint is linear already, about any angle' });
  if (errors.length > 0) return { ok: false, errors };
  const nl = resolveNonlinear(scenario.nonlinear);
  const theta0 = request.angle;
  const phi0 = theta0 + nl.gravityOffset;
  const W = nl.gravityTorque;
  const k = scenario.joint.stiffness;
  const effectiveStiffness = k + W * Math.cos(phi0);
  const holdingTorque = k * theta0 + W * Math.sin(phi0);
  const atRest = { angle: 0, velocity: 0 };
  // In δ the spring's own torque −k·(δ + θ0) is −k·δ, which the twin models, and a constant
  // −k·θ0, which the nonlinear joint carries as a torque; gravity moves with the shifted offset.
  // Feed-forward adds the holding torque to it (and in the linear model cancels −H exactly).
  const feedForward = request.holding === 'feed-forward';
  const constantOnNonlinear = (feedForward ? holdingTorque : 0) - k * theta0;
  const nonlinearInputs = constantOnNonlinear !== 0 ? [...scenario.inputs, step(constantOnNonlinear)] : scenario.inputs;
  const linearInputs = !feedForward && holdingTorque !== 0 ? [...scenario.inputs, step(-holdingTorque)] : scenario.inputs;
  const { gravity: _gravity, coulombFriction, staticFriction, ...rest } = scenario.nonlinear ?? ({} as NonlinearBlock);
  void _gravity;
  const frictionOn = (coulombFriction ?? 0) > 0 || (staticFriction ?? 0) > 0;
  const deg = (x: number) => `${+((x * 180) / Math.PI).toPrecision(6)}°`;
  const notes = [
    `linearized about θ0 = ${+theta0.toPrecision(6)} rad (${deg(theta0)}): angles are measured from θ0`,
    `effective stiffness k + m·g·l·cos(θ0 + offset) = ${+effectiveStiffness.toPrecision(6)} N·m/rad`,
    feedForward
      ? `holding torque ${+holdingTorque.toPrecision(6)} N·m supplied by feed-forward: θ0 is an equilibrium`
      : `holding torque ${+holdingTorque.toPrecision(6)} N·m left to the loop: a constant torque of ${+(-holdingTorque).toPrecision(6)} N·m acts from t = 0`,
    ...(frictionOn ? ['friction is left out of the linear model: it has none'] : []),
    ...(effectiveStiffness < 0 ? ['above its balance point the joint tips away from θ0 by itself: the open-loop plant is unstable'] : []),
  ];
  const tag = (suffix: string) => `${scenario.name} ${suffix}`.slice(0, 120);
  const linear = parseScenario({
    ...scenario,
    name: tag(`· linear about ${deg(theta0)}`),
    notes: [scenario.notes, notes.join('; ')].filter((x) => x).join('\n').slice(0, 4000),
    joint: { ...scenario.joint, stiffness: effectiveStiffness },
    initial: atRest,
    inputs: linearInputs,
    nonlinear: rest,
  });
  const nonlinear = parseScenario({
    ...scenario,
    name: tag(`· about ${deg(theta0)}`),
    initial: atRest,
    inputs: nonlinearInputs,
    nonlinear: { ...scenario.nonlinear, gravity: { ...gravity, offset: wrapAngle(phi0) } },
  });
  if (!linear.ok) return linear;
  if (!nonlinear.ok) return nonlinear;
  return { ok: true, value: { linear: linear.value, nonlinear: nonlinear.value, moves: scenario.inputs, effectiveStiffness, holdingTorque, notes } };
}
