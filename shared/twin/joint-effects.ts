/**
 * The static nonlinearities of the twin's joint, as pure functions of one value each. The
 * stateful ones have regimes of their own: stiction in friction-regime.ts, the controller's
 * sampling in sampled-pid.ts.
 */

/**
 * Drive torque that reaches the joint: the request is clamped to ±limit (motor saturation), then
 * the dead band ±deadBand is taken out of it (torque lost in the transmission before it moves
 * the joint). With limit = Infinity and deadBand = 0 the request passes unchanged.
 * Why its edges (±limit, ±deadBand) cannot chatter: the map is continuous and piecewise linear in
 * the request, so the right-hand side stays continuous across them and odex steps over a kink
 * under its error control with no regime to switch. Only the anti-windup rule switches there,
 * and that is a regime of its own (continuous-pid.ts).
 * @param requested N·m at the joint
 * @param limit N·m, Infinity when off
 * @param deadBand N·m, ≥ 0
 * @example driveTorque(5, 2, 0.5) // 1.5
 */
export function driveTorque(requested: number, limit: number, deadBand: number): number {
  const clamped = requested > limit ? limit : requested < -limit ? -limit : requested;
  if (deadBand === 0) return clamped;
  if (clamped > deadBand) return clamped - deadBand;
  if (clamped < -deadBand) return clamped + deadBand;
  return 0;
}

/**
 * Gravity torque on the joint, m·g·l·sin(θ + offset), acting to lower the centre of mass.
 * @param angle θ, rad
 * @param weightMoment m·g·l, N·m
 * @param offset rad: angle of the centre of mass from straight down at θ = 0
 * @example gravityTorque(0, 2, Math.PI / 2) // −2: a horizontal arm pulls down with m·g·l
 */
export function gravityTorque(angle: number, weightMoment: number, offset: number): number {
  return weightMoment === 0 ? 0 : -weightMoment * Math.sin(angle + offset);
}

/**
 * Angle an encoder with `counts` per revolution reports: the nearest whole count (round half
 * up), so the error is at most half a count. counts = 0 means an exact measurement.
 * @param angle rad
 * @example quantizeAngle(0.01, 360) // 0.017453292519943295 (one count of 1°)
 */
export function quantizeAngle(angle: number, counts: number): number {
  if (counts === 0) return angle;
  const step = (2 * Math.PI) / counts;
  return step * Math.floor(angle / step + 0.5);
}
