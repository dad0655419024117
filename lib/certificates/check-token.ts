// The public check token printed (as a QR code) on every certificate: 32 random bytes (256 bits)
// in base64url, so it cannot be guessed or enumerated. Only its SHA-256 is stored; the token
// itself lives on the printed certificate.
import crypto from 'node:crypto';

export function newCheckToken(): string {
  return crypto.randomBytes(32).toString('base64url');
}

export function hashCheckToken(token: string): string {
  return crypto.createHash('sha256').update(token, 'utf8').digest('hex');
}

/** Anything that is not the shape we mint is refused before it reaches the database. */
export function isWellFormedCheckToken(token: string): boolean {
  return /^[A-Za-z0-9_-]{43}$/.test(token);
}

export function checkUrl(appUrl: string, token: string): string {
  return `${appUrl.replace(/\/+$/, '')}/check/${token}`;
}

export function sha256Hex(bytes: Uint8Array): string {
  return crypto.createHash('sha256').update(bytes).digest('hex');
}
