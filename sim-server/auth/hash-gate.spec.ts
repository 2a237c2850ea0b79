import { describe, expect, it } from 'vitest';
import { HashGate } from './hash-gate';

describe('HashGate', () => {
  it('runs at most `limit` jobs at once, the rest in arrival order, and frees the slot of a failed job', async () => {
    const gate = new HashGate(2);
    const log: string[] = [];
    let running = 0;
    let most = 0;
    const releases: (() => void)[] = [];
    const job = (name: string, fail = false) =>
      gate.run(async () => {
        running++;
        most = Math.max(most, running);
        log.push(`start ${name}`);
        await new Promise<void>((resolve) => releases.push(resolve));
        running--;
        if (fail) throw new Error(name);
        return name;
      });
    const settled = Promise.allSettled([job('a', true), job('b'), job('c'), job('d')]);
    await Promise.resolve();
    expect(log).toEqual(['start a', 'start b']);
    while (releases.length) {
      releases.shift()!();
      await new Promise((r) => setImmediate(r));
    }
    expect((await settled).map((s) => s.status)).toEqual(['rejected', 'fulfilled', 'fulfilled', 'fulfilled']);
    expect(log).toEqual(['start a', 'start b', 'start c', 'start d']);
    expect(most).toBe(2);
  });
});
