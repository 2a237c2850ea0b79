import { logFrequencies } from '../../shared/frequency/frequency-grid';
import { defaultSweepAmplitude, defaultSweepChannel } from '../../shared/frequency/twin-sine-sweep';
import type { SineSweepResponse } from '../../shared/protocol/check-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import type { FieldError } from '../../shared/validation/field-errors';
import type { CheckPool } from './check-pool';

export interface SweepRequest {
  scenario: Scenario;
  from: number;
  to: number;
  points: number;
  channel?: 'reference' | 'torque';
  amplitude?: number;
}

/**
 * The twin's measured sweep spread over the pool's threads: every frequency is its own twin
 * run, so the frequencies are dealt out round-robin (low ones, with their long transients, land
 * on different threads) and the points come back in the order asked for.
 */
export async function sweepOnPool(pool: CheckPool, request: SweepRequest, cancel?: AbortSignal): Promise<SineSweepResponse | { errors: FieldError[] }> {
  const grid = request.points === 1 ? ({ ok: true, value: [request.from] } as const) : logFrequencies(request);
  if (!grid.ok) return { errors: grid.errors };
  const channel = request.channel ?? defaultSweepChannel(request.scenario);
  const amplitude = request.amplitude ?? defaultSweepAmplitude(request.scenario, channel);
  const lanes = Math.max(1, Math.min(pool.workers, grid.value.length));
  const dealt = Array.from({ length: lanes }, (_, lane) => grid.value.filter((_, i) => i % lanes === lane));
  const started = performance.now();
  // One part failing (a full queue, the time limit) stops the others: the sweep is answered as a whole.
  const siblings = new AbortController();
  const signal = cancel ? AbortSignal.any([cancel, siblings.signal]) : siblings.signal;
  const parts = await Promise.all(
    dealt.map((frequencies) =>
      pool.run({ kind: 'sine-sweep', scenario: request.scenario, frequencies, channel, amplitude }, signal).catch((err: unknown) => {
        siblings.abort();
        throw err;
      }),
    ),
  );
  const refused = parts.find((p) => 'errors' in p);
  if (refused && 'errors' in refused) return refused;
  const answered = parts as SineSweepResponse[];
  const points = grid.value.map((_, i) => answered[i % lanes]!.points[Math.floor(i / lanes)]!);
  return { channel, amplitude, points, elapsedMs: Math.round((performance.now() - started) * 10) / 10 };
}
