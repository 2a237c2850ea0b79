import { absComplex, addComplex, complex, expComplex, multiplyComplex } from '../closed-form/complex-number';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { poleLocation } from '../closed-form/pole-location';
import { isZeroPolynomial, zeroRootCount } from '../closed-form/polynomial';
import { valueAtZero, type RationalFunction } from '../closed-form/rational-function';
import { cornerFrequencies, type FrequencyChannel } from './frequency-channel';
import { continuePhase, trackPhase } from './phase-tracking';

/** Gain and phase margins of the loop and the closed loop's bandwidth; null where undefined. */
export interface StabilityMargins {
  /** −20·log10|L| at the phase crossover where |L| is largest (the smallest margin), dB; negative: the gain must fall that much. */
  gainMarginDb: number | null;
  /** Where the loop's phase crosses −180° (mod 360°), rad/s. */
  phaseCrossover: number | null;
  /** 180° + arg L at the gain crossover with the smallest margin, degrees in (−180, 180]. */
  phaseMarginDeg: number | null;
  /** Where |L| = 1, rad/s. */
  gainCrossover: number | null;
  /** Lowest frequency where |Θ/R| falls 3 dB (a factor 1/√2) below its value at 0, rad/s. */
  bandwidth: number | null;
}

/** Whether the closed loop is stable, as decided from its poles or, with a delay, by Nyquist. */
export type LoopStability = 'stable' | 'marginal' | 'unstable' | 'undetermined' | 'no-loop';

export interface MarginReport {
  margins: StabilityMargins;
  stability: LoopStability;
  /** Plain statements about the verdicts, e.g. "no gain crossover: |L| stays below 1". */
  notes: string[];
}

/** Scan density for finding crossovers; each is then refined by bisection. */
const SCAN_POINTS_PER_DECADE = 100;
const BISECTIONS = 60;
/** A phase this close to −180° on both sides of a step is sitting on the level, not crossing it. */
const PHASE_LEVEL_TOLERANCE_DEG = 1e-9;

const NO_MARGINS: StabilityMargins = { gainMarginDb: null, phaseCrossover: null, phaseMarginDeg: null, gainCrossover: null, bandwidth: null };

interface Scan {
  w: number[];
  logMagnitude: number[];
  phase: number[];
}

/** Log-spaced scan frequencies covering every corner of the loop by three decades either side. */
function scanRange(loop: FrequencyChannel, from: number, to: number): [number, number] {
  const corners = cornerFrequencies(loop.rational);
  let lo = from;
  let hi = to;
  for (const c of corners) {
    lo = Math.min(lo, 1e-3 * c);
    hi = Math.max(hi, 1e3 * c);
  }
  // A delay turns the phase ever faster: reach where it has turned a few times past the corners.
  if (loop.delay > 0) hi = Math.max(hi, 100 / loop.delay);
  return [lo, hi];
}

function scan(channel: FrequencyChannel, lo: number, hi: number): Scan {
  const decades = Math.log10(hi / lo);
  const n = Math.max(2, Math.ceil(decades * SCAN_POINTS_PER_DECADE) + 1);
  const w = Array.from({ length: n }, (_, i) => lo * 10 ** ((decades * i) / (n - 1)));
  return { w, logMagnitude: w.map((x) => Math.log10(absComplex(channel.at(x)))), phase: trackPhase(channel, w) };
}

/** The continuous phase of the whole channel at w, from its phase pa at wa (both include the pure delay). */
function phaseFrom(channel: FrequencyChannel, wa: number, pa: number, w: number): number {
  const tau = channel.delay * (180 / Math.PI);
  return continuePhase(channel, wa, pa + wa * tau, w) - w * tau;
}

/** Bisection on a log axis for the zero of f between wa and wb (f(wa), f(wb) of opposite sign). */
function bisect(f: (w: number) => number, wa: number, wb: number): number {
  let a = wa;
  let b = wb;
  const fa = f(a);
  for (let i = 0; i < BISECTIONS && b / a > 1 + 1e-14; i++) {
    const m = Math.sqrt(a * b);
    if (f(m) * fa > 0) a = m;
    else b = m;
  }
  return Math.sqrt(a * b);
}

/** Normalises a phase margin 180° + φ into (−180°, 180°]. */
function marginOf(phaseDeg: number): number {
  const m = phaseDeg + 180;
  const r = m - 360 * Math.ceil((m - 180) / 360);
  return r === -180 ? 180 : r;
}

function crossovers(loop: FrequencyChannel, s: Scan) {
  const gain: { w: number; pm: number }[] = [];
  const phase: { w: number; gm: number }[] = [];
  for (let i = 0; i + 1 < s.w.length; i++) {
    const [wa, wb] = [s.w[i]!, s.w[i + 1]!];
    const [ma, mb] = [s.logMagnitude[i]!, s.logMagnitude[i + 1]!];
    const pa = s.phase[i]!;
    const pb = s.phase[i + 1]!;
    if (Number.isFinite(ma) && Number.isFinite(mb) && (ma === 0 || ma * mb < 0)) {
      const w = ma === 0 ? wa : bisect((x) => Math.log10(absComplex(loop.at(x))), wa, wb);
      gain.push({ w, pm: marginOf(phaseFrom(loop, wa, pa, w)) });
    }
    const ka = Math.floor((pa + 180) / 360);
    const kb = Math.floor((pb + 180) / 360);
    if (ka !== kb) {
      const level = 360 * Math.max(ka, kb) - 180;
      if (Math.abs(pa - level) < PHASE_LEVEL_TOLERANCE_DEG && Math.abs(pb - level) < PHASE_LEVEL_TOLERANCE_DEG) continue;
      const w = bisect((x) => phaseFrom(loop, wa, pa, x) - level, wa, wb);
      const magnitude = absComplex(loop.at(w));
      if (magnitude > 0 && Number.isFinite(magnitude)) phase.push({ w, gm: -20 * Math.log10(magnitude) });
    }
  }
  return { gain, phase };
}

/** The closed loop's −3 dB bandwidth from Θ/R, or null when Θ/R(0) is 0 or unbounded or it never falls. */
function bandwidthOf(referenceToAngle: FrequencyChannel, lo: number, hi: number): number | null {
  const dc = valueAtZero(referenceToAngle.rational);
  if (dc === null || dc === 0) return null;
  const level = Math.abs(dc) / Math.SQRT2;
  const below = (w: number) => Math.log10(absComplex(referenceToAngle.at(w)) / level);
  const decades = Math.log10(hi / lo);
  const n = Math.ceil(decades * SCAN_POINTS_PER_DECADE) + 1;
  let prev = lo;
  if (below(prev) < 0) return null;
  for (let i = 1; i < n; i++) {
    const w = lo * 10 ** ((decades * i) / (n - 1));
    if (below(w) < 0) return bisect(below, prev, w);
    prev = w;
  }
  return null;
}

/** Right-half-plane poles, axis poles away from the origin, and origin poles of a rational. */
function poleCounts(den: number[]): { right: number; axis: number; origin: number } | null {
  const roots = polynomialRoots(den);
  if (!roots.ok) return null;
  const origin = zeroRootCount(den);
  let right = 0;
  let axis = 0;
  for (const p of roots.roots) {
    if (p.re === 0 && p.im === 0) continue;
    const where = poleLocation(p);
    if (where === 'right') right++;
    else if (where === 'axis') axis++;
  }
  return { right, axis, origin };
}

/**
 * Stability of the loop with a delay, by the Nyquist criterion (Nyquist 1932; common practice):
 * Z = N + P closed-loop poles in the right half-plane, P the loop's own, N the clockwise turns of
 * L(jω) around −1 along the D-contour — twice the phase change of 1 + L(jω) from 0+ to ∞ (the
 * negative half mirrors it) and −180° per pole at the origin for the small arc that passes it.
 */
function nyquistStability(loop: FrequencyChannel, loopRational: RationalFunction, poles: { right: number; origin: number }, lo: number, hi: number): LoopStability {
  const loopAt = (w: number) => multiplyComplex(loop.at(w), expComplex(complex(0, -w * loop.delay)));
  const returnDifference: FrequencyChannel = {
    at: (w) => addComplex(complex(1), loopAt(w)),
    // As ω → 0 with poles at the origin 1 + L behaves as L; without them it tends to 1 + L(0).
    rational: poles.origin > 0 ? loopRational : { num: [1 + (valueAtZero(loopRational) ?? 0)], den: [1] },
    delay: 0,
    innerDelay: loop.delay,
  };
  if (poles.origin === 0 && 1 + (valueAtZero(loopRational) ?? 0) === 0) return 'marginal';
  // Go on until |L| is small, so 1 + L has settled near 1 and its phase near a multiple of 360°.
  let top = hi;
  while (absComplex(loop.at(top)) > 1e-3 && top < 1e12) top *= 10;
  const phases = trackPhase(returnDifference, [lo, top]);
  const total = 2 * (phases[1]! - phases[0]!) - 180 * poles.origin;
  const z = Math.round(-total / 360) + poles.right;
  return z === 0 ? 'stable' : 'unstable';
}

/**
 * Margins and stability of the loop. Crossovers are found on a log scan three decades past every
 * corner of the loop and refined by bisection; with several, each margin is the smallest of its
 * kind (common practice).
 */
export function marginsOf(
  loop: FrequencyChannel | null,
  loopRational: RationalFunction | null,
  referenceToAngle: FrequencyChannel | null,
  characteristic: number[],
  from: number,
  to: number,
): MarginReport {
  if (!loop || !loopRational || !referenceToAngle) {
    return { margins: NO_MARGINS, stability: 'no-loop', notes: ['open loop: there is no feedback, so no margins and no bandwidth'] };
  }
  const notes: string[] = [];
  const [lo, hi] = scanRange(loop, from, to);
  const s = scan(loop, lo, hi);
  const { gain, phase } = crossovers(loop, s);
  const worstGain = gain.reduce<(typeof gain)[number] | null>((best, c) => (best === null || c.pm < best.pm ? c : best), null);
  const nearestPhase = phase.reduce<(typeof phase)[number] | null>((best, c) => (best === null || c.gm < best.gm ? c : best), null);
  if (!worstGain) notes.push(s.logMagnitude.every((m) => m < 0) ? 'no gain crossover: |L| stays below 1, so there is no phase margin' : 'no gain crossover: |L| stays above 1, so there is no phase margin');
  if (!nearestPhase) notes.push('no phase crossover: the loop phase never reaches −180°, so the gain margin is unbounded');
  if (gain.length > 1) notes.push(`${gain.length} gain crossovers: the phase margin is the smallest of them`);
  if (phase.length > 1) notes.push(`${phase.length} phase crossovers: the gain margin is the smallest of them`);

  const poles = poleCounts(loopRational.den);
  const noFeedback = isZeroPolynomial(loopRational.num);
  if (noFeedback) notes.push('every gain is zero: the loop carries no feedback');
  let stability: LoopStability;
  // With no feedback a delay in the loop changes nothing: the poles are the plant's.
  if (loop.delay === 0 || noFeedback) {
    const roots = polynomialRoots(characteristic);
    if (!roots.ok) stability = 'undetermined';
    else {
      const where = roots.roots.map(poleLocation);
      stability = where.includes('right') ? 'unstable' : where.includes('axis') ? 'marginal' : 'stable';
    }
  } else if (!poles || poles.axis > 0) {
    stability = 'undetermined';
    notes.push('stability with the sampled delay is undetermined: the loop has undamped poles on the imaginary axis');
  } else {
    stability = nyquistStability(loop, loopRational, poles, lo, hi);
    notes.push('stability decided by the Nyquist criterion on the frequency response with the sampled delay');
  }
  if (poles && poles.right > 0) {
    notes.push(`the open-loop plant is unstable (${poles.right} pole${poles.right > 1 ? 's' : ''} in the right half-plane): positive margins alone do not mean a stable loop`);
  }
  notes.unshift(
    stability === 'stable' ? 'stable loop' : stability === 'unstable' ? 'unstable loop' : stability === 'marginal' ? 'marginally stable loop: a closed-loop pole on the imaginary axis' : 'stability undetermined',
  );
  return {
    margins: {
      gainMarginDb: nearestPhase?.gm ?? null,
      phaseCrossover: nearestPhase?.w ?? null,
      phaseMarginDeg: worstGain?.pm ?? null,
      gainCrossover: worstGain?.w ?? null,
      bandwidth: bandwidthOf(referenceToAngle, lo, hi),
    },
    stability,
    notes,
  };
}
