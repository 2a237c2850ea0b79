import bcrypt from 'bcryptjs';

/** bcrypt cost factor: about 60 ms per hash on this class of machine (measured), slow enough for a login. */
export const BCRYPT_COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// Compared against when the e-mail is unknown, so a wrong e-mail costs as long as a wrong password.
const unknownUserHash = bcrypt.hashSync('no such user: timing equaliser', BCRYPT_COST);

export function burnPasswordCheck(password: string): Promise<boolean> {
  return bcrypt.compare(password, unknownUserHash);
}
