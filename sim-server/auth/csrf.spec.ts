import { describe, expect, it } from 'vitest';
import { handshakeOriginAllowed } from './csrf';

describe('handshakeOriginAllowed', () => {
  const app = 'https://kinetwin.example.test';
  it.each([
    [undefined, '127.0.0.1:4300', true],
    ['https://kinetwin.example.test', 'internal:4300', true],
    ['http://127.0.0.1:4200', '127.0.0.1:4200', true],
    ['https://evil.example', '127.0.0.1:4300', false],
    ['http://127.0.0.1:4200', '127.0.0.1:4300', false],
    ['null', '127.0.0.1:4300', false],
  ])('origin %s on host %s → %s', (origin, host, allowed) => {
    expect(handshakeOriginAllowed(origin, host, app)).toBe(allowed);
  });
});
