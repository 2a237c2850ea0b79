import bcrypt from 'bcryptjs';
import { afterAll, describe, expect, it } from 'vitest';
import { closeBcryptWorker } from './legacy-bcrypt';
import { burnPasswordCheck, checkPassword, hashPassword, SCRYPT_PARAMS } from './passwords';

describe('password hashing', () => {
  afterAll(() => closeBcryptWorker());

  it('writes scrypt hashes in PHC string format with a fresh salt, and checks them', async () => {
    const a = await hashPassword('wrist-pitch-22');
    const b = await hashPassword('wrist-pitch-22');
    expect(a).toMatch(new RegExp(`^\\$scrypt\\$ln=${SCRYPT_PARAMS.log2N},r=8,p=${SCRYPT_PARAMS.p}\\$[A-Za-z0-9+/]{22}\\$[A-Za-z0-9+/]{43}$`));
    expect(a).not.toBe(b);
    expect(await checkPassword('wrist-pitch-22', a)).toEqual({ match: true, rehash: false });
    expect(await checkPassword('wrist-pitch-23', a)).toEqual({ match: false, rehash: false });
  });

  it('asks for a rehash of a matching hash made at another cost', async () => {
    // A hash as a cheaper, older setting (N = 2^10, p = 1) would have written it.
    const { scrypt } = await import('node:crypto');
    const salt = Buffer.from('0123456789abcdef');
    const key = await new Promise<Buffer>((resolve, reject) => scrypt('elbow', salt, 32, { N: 1024, r: 8, p: 1 }, (err, k) => (err ? reject(err) : resolve(k))));
    const older = `$scrypt$ln=10,r=8,p=1$${salt.toString('base64').replace(/=+$/, '')}$${key.toString('base64').replace(/=+$/, '')}`;
    expect(await checkPassword('elbow', older)).toEqual({ match: true, rehash: true });
    expect(await checkPassword('knee', older)).toEqual({ match: false, rehash: false });
  });

  it('checks legacy bcrypt hashes in a worker thread and asks for their rehash', async () => {
    const legacy = bcrypt.hashSync('shoulder-yaw-5', 4);
    expect(await checkPassword('shoulder-yaw-5', legacy)).toEqual({ match: true, rehash: true });
    expect(await checkPassword('shoulder-yaw-6', legacy)).toEqual({ match: false, rehash: false });
  });

  it('never matches an unreadable hash or the unknown-user hash, and refuses absurd stored costs', async () => {
    expect(await checkPassword('x', 'not a hash')).toEqual({ match: false, rehash: false });
    expect(await checkPassword('x', '$scrypt$ln=40,r=8,p=1$AAAAAAAAAAAAAAAAAAAAAA$AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA')).toEqual({ match: false, rehash: false });
    expect(await burnPasswordCheck('')).toBe(false);
    expect(await burnPasswordCheck('no such user: timing equaliser')).toBe(false);
  });
});
