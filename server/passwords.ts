// Password hashing (bcrypt). Plain passwords never leave this module's callers' memory: they are
// neither stored nor logged.
import bcrypt from 'bcryptjs';

const COST = 11;
/** bcrypt reads only the first 72 bytes; longer passwords are refused rather than cut silently. */
export const MAX_PASSWORD_BYTES = 72;
export const MIN_PASSWORD_LENGTH = 10;

export function passwordBytes(password: string): number {
  return new TextEncoder().encode(password).length;
}

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
