import { endianness } from 'node:os';

/**
 * A signal's Float64 samples as the bytes stored in joint_logs (little-endian, 8 a value) and
 * back. On a little-endian host (every one this runs on) writing is a view of the array itself.
 */

const LITTLE = endianness() === 'LE';

export function samplesToBytes(values: Float64Array): Buffer {
  if (LITTLE) return Buffer.from(values.buffer, values.byteOffset, values.byteLength);
  const out = Buffer.alloc(values.length * 8);
  values.forEach((v, i) => out.writeDoubleLE(v, i * 8));
  return out;
}

/** The samples in stored bytes, or null when the length is not a whole number of Float64s. */
export function bytesToSamples(bytes: Buffer): Float64Array | null {
  if (bytes.length % 8 !== 0) return null;
  const out = new Float64Array(bytes.length / 8);
  // pg's Buffer may start at any offset in its pool: copying into a fresh array aligns it.
  if (LITTLE) new Uint8Array(out.buffer).set(bytes);
  else for (let i = 0; i < out.length; i++) out[i] = bytes.readDoubleLE(i * 8);
  return out;
}
