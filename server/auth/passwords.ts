import argon2 from 'argon2';

/**
 * argon2id with the OWASP Password Storage Cheat Sheet's first listed configuration
 * (m = 19 MiB, t = 2, p = 1).
 */
const OPTIONS = { type: argon2.argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, OPTIONS);
}

let dummyHash: Promise<string> | undefined;

/**
 * Checks a password. With no stored hash it still spends the same work on a dummy hash, so an
 * unknown e-mail and a wrong password take about as long and answer the same.
 */
export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    dummyHash ??= argon2.hash('not-a-real-password', OPTIONS);
    await argon2.verify(await dummyHash, password).catch(() => false);
    return false;
  }
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}
