import argon2 from 'argon2';

// argon2id with the library's defaults (m = 64 MiB, t = 3, p = 4) meets OWASP's password-storage
// guidance; the parameters are encoded in the hash, so they can be raised later without a migration.
export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id });
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    // A malformed stored hash (e.g. a placeholder) must read as "wrong password", never as a crash.
    return false;
  }
}

/** A hash of a random password nobody knows: lets unknown e-mails take the same time as known ones. */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword('not-a-real-password-' + Math.random());
  return dummyHash;
}
