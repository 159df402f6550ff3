/**
 * Single-use secrets sent by mail (invitation and password reset links). The
 * link carries the token; the database keeps only its sha256, so a copy of
 * the database does not let anyone in.
 */
import { createHash, randomBytes } from 'node:crypto'

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}

/** 32 random bytes as URL-safe text, and the hash to store. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashToken(token) }
}
