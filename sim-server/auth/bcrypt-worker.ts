import bcrypt from 'bcryptjs';

/**
 * The worker thread's task (piscina calls the default export): checks a password against a
 * legacy bcrypt hash. bcryptjs is plain JavaScript, so on the main thread its ~60 ms per check
 * (cost 10) would hold the event loop.
 */
export default function verifyBcrypt({ password, hash }: { password: string; hash: string }): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
