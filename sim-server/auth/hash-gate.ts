/**
 * At most `limit` password hashes at once; the rest wait in arrival order. scrypt runs in libuv's
 * thread pool (four threads by default), which also serves file and DNS work: without a bound,
 * a burst of sign-ins would queue those behind every hash.
 */
export class HashGate {
  private running = 0;
  private readonly waiting: (() => void)[] = [];

  constructor(private limit: number) {}

  /** Changes the bound (create-app sets PASSWORD_HASH_CONCURRENCY); waiting work starts if there is room. */
  setLimit(limit: number): void {
    this.limit = Math.max(1, limit);
    this.startWaiting();
  }

  /** Runs `work` once a slot is free; the slot is given back however the work ends. */
  async run<T>(work: () => Promise<T>): Promise<T> {
    if (this.running >= this.limit) await new Promise<void>((resolve) => this.waiting.push(resolve));
    else this.running++;
    try {
      return await work();
    } finally {
      this.running--;
      this.startWaiting();
    }
  }

  private startWaiting(): void {
    while (this.running < this.limit && this.waiting.length > 0) {
      this.running++;
      this.waiting.shift()!();
    }
  }
}
