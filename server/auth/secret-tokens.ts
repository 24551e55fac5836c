import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

/** A URL-safe random token (256 bits) for invitations, resets and API tokens. */
export function newToken(prefix = ''): string {
  return prefix + randomBytes(32).toString('base64url');
}

/** Tokens are stored as SHA-256 only: a leaked database does not leak usable links. */
export function sha256Hex(value: string | Buffer): string {
  return createHash('sha256').update(value).digest('hex');
}

export function safeEqual(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  return ab.length === bb.length && timingSafeEqual(ab, bb);
}
