import crypto from 'node:crypto';

/** A fresh single-use token for an e-mailed link, and the SHA-256 hash we store instead of it. */
export function newToken(): { token: string; hash: string } {
  const token = crypto.randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return crypto.createHash('sha256').update(token).digest('hex');
}
