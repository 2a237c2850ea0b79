/**
 * The joint's friction regime: Coulomb friction τc while it slides, static friction up to the
 * breakaway torque τs while it is held (Armstrong-Hélouvry, Dupont & Canudas de Wit, A survey of
 * models, analysis tools and compensation methods for the control of machines with friction,
 * Automatica 1994, the Coulomb + static model, from memory). The regime switches only at located
 * events, like the anti-windup regime of continuous-pid.ts, so odex never steps across a switch.
 *
 * Why stick/slip cannot chatter: a slide starts only where |τ_net| > τs ≥ τc, so its acceleration
 * (τ_net − s·τc)/J has the slide's sign and carries the velocity away from zero; a slide ends at
 * exactly v = 0 and sticks only where |τ_net| ≤ τs, and stays stuck until the net torque has
 * changed by a finite amount. Zeno-like hunting of a drive held at the breakaway threshold is
 * bounded by the run's maxFrictionEvents and its work budget.
 */

/** The friction's part of a run's state. */
export interface FrictionState {
  /** +1 or −1 sliding in that direction, 0 held by static friction. */
  slip: number;
  /** Stick/slip switches at located events so far. */
  events: number;
}

/** A run that has not started: held, until its first arrival chooses the regime. */
export function initialFrictionState(): FrictionState {
  return { slip: 0, events: 0 };
}

/**
 * The friction event function: it turns positive when the regime must change.
 * @param velocity θ′, rad/s
 * @param net every torque on the joint except friction, N·m (read only while held)
 * @param staticFriction τs, N·m
 */
export function frictionEvent(slip: number, velocity: number, net: number, staticFriction: number): number {
  if (slip !== 0) return -slip * velocity;
  return Math.abs(net) - staticFriction;
}

/**
 * The regime a state is in: sliding with a nonzero velocity, else breaking away only where the
 * net torque exceeds τs.
 */
export function chooseSlip(velocity: number, net: number, staticFriction: number): number {
  if (velocity !== 0) return Math.sign(velocity);
  return Math.abs(net) > staticFriction ? Math.sign(net) : 0;
}

/**
 * The run's stop message once the stick/slip switches exceed `maxEvents`.
 * @param t s, the event that crossed the bound
 */
export function frictionBoundMessage(maxEvents: number, t: number): string {
  return `friction event bound: ${maxEvents} stick/slip switches by t = ${t.toFixed(4)} s; the joint is being driven around the stiction threshold faster than the twin can follow`;
}
