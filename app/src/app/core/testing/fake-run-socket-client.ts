import type { Ack } from '@kinetwin/shared/protocol/ack';

type Listener = (...args: never[]) => void;
type AckFn = (ack: Ack<unknown>) => void;

/** Stands in for the socket.io client: records what the service emits and plays what a server sends. */
export class FakeRunSocketClient {
  active = true;
  disconnected = false;
  readonly emitted: { event: string; payload: unknown; ack: AckFn }[] = [];
  private readonly listeners = new Map<string, Listener[]>();

  on(event: string, listener: Listener): this {
    this.listeners.set(event, [...(this.listeners.get(event) ?? []), listener]);
    return this;
  }

  emit(event: string, payload: unknown, ack: AckFn): this {
    this.emitted.push({ event, payload, ack });
    return this;
  }

  disconnect(): this {
    this.disconnected = true;
    return this;
  }

  /** The server (or socket.io itself) raising `event`. */
  receive(event: string, ...args: unknown[]): void {
    for (const listener of this.listeners.get(event) ?? []) (listener as (...a: unknown[]) => void)(...args);
  }

  last(event: string): { payload: unknown; ack: AckFn } {
    const found = this.emitted.filter((e) => e.event === event).at(-1);
    if (!found) throw new Error(`nothing emitted on ${event}`);
    return found;
  }
}
