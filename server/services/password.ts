// Password hashing with bcrypt (bcryptjs: pure JavaScript, no native build step).
import bcrypt from 'bcryptjs';

export function hashPassword(password: string, rounds: number): Promise<string> {
  return bcrypt.hash(password, rounds);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// Compared against when the e-mail is unknown, so a wrong address costs as long as a wrong
// password: made with the rounds of the stored hashes, since each round doubles the cost.
const unknownUserHashes = new Map<number, string>();
export function unknownUserHash(rounds: number): string {
  let hash = unknownUserHashes.get(rounds);
  if (!hash) unknownUserHashes.set(rounds, (hash = bcrypt.hashSync('no such user', rounds)));
  return hash;
}
