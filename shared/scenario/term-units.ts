import type { InputChannel, InputShape, InputTerm } from './scenario-schema';

/**
 * The unit of an input term's amplitude, which the catalogue can only give as "rad or N·m": rad
 * on the reference channel, N·m on the torque channel, per second for a ramp (its amplitude is a
 * slope), N·m·s for an impulse (its amplitude is the area under the torque).
 * @example amplitudeUnit('reference', 'ramp') // 'rad/s'
 */
export function amplitudeUnit(channel: InputChannel, shape: InputShape): string {
  if (shape === 'impulse') return 'N·m·s';
  const base = channel === 'reference' ? 'rad' : 'N·m';
  return shape === 'ramp' ? `${base}/s` : base;
}

/** The quantity a shape has beyond amplitude and delay, as the key of its InputTerm field. */
export function extraTermKey(shape: InputShape): 'width' | 'frequency' | 'rate' | null {
  if (shape === 'pulse') return 'width';
  if (shape === 'sine' || shape === 'cosine') return 'frequency';
  if (shape === 'decay') return 'rate';
  return null;
}

/** The term's numeric fields in the order forms show them: amplitude, delay, then its extra one. */
export function termKeys(term: Pick<InputTerm, 'shape'>): ('amplitude' | 'delay' | 'width' | 'frequency' | 'rate')[] {
  const extra = extraTermKey(term.shape);
  return extra ? ['amplitude', 'delay', extra] : ['amplitude', 'delay'];
}
