// Password hashing with bcrypt (bcryptjs: pure JavaScript, no native build step).
import bcrypt from 'bcryptjs';

export function hashPassword(password: string, rounds: number): Promise<string> {
  return bcrypt.hash(password, rounds);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// Compared against when the e-mail is unknown, so a wrong address costs as long as a wrong password.
export const unknownUserHash = bcrypt.hashSync('no such user', 10);
