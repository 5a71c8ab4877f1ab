import bcrypt from 'bcryptjs';

/** bcrypt cost 10: the minimum OWASP's password storage cheat sheet recommends (common practice). */
const COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
