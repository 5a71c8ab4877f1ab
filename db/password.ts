import bcrypt from 'bcryptjs';

/** bcrypt cost 10: the minimum OWASP's password storage cheat sheet recommends (common practice). */
const COST = 10;
/** bcrypt reads no further (Provos and Mazières 1999, §6); app/_lib/schemas.ts refuses longer at the field. */
const MAX_BYTES = 72;

export function hashPassword(password: string): Promise<string> {
  if (Buffer.byteLength(password, 'utf8') > MAX_BYTES) throw new RangeError(`password longer than ${MAX_BYTES} bytes`);
  return bcrypt.hash(password, COST);
}

/** A password longer than bcrypt reads never matches (it would be cut and could match a shorter one); the compare runs anyway, for even timing. */
export async function verifyPassword(password: string, hash: string): Promise<boolean> {
  const matches = await bcrypt.compare(password, hash);
  return matches && Buffer.byteLength(password, 'utf8') <= MAX_BYTES;
}
