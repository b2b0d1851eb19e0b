import { createHash, randomBytes } from 'node:crypto';

// High-entropy secrets handed to people (API tokens, links sent by e-mail). Only their SHA-256
// is stored: with 256 random bits a fast hash is enough; no salt or slow hash is needed.

export const API_TOKEN_PREFIX = 'ew_';

/** 32 random bytes as base64url (43 characters). */
export function randomSecret(): string {
  return randomBytes(32).toString('base64url');
}

/** A new API token: `ew_` + 43 base64url characters. */
export function newApiToken(): string {
  return `${API_TOKEN_PREFIX}${randomSecret()}`;
}

/** Lower-case hex SHA-256 of the secret's UTF-8 bytes. */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

/** True when the text has the shape of one of our API tokens (checked before any lookup). */
export function looksLikeApiToken(text: string): boolean {
  return /^ew_[A-Za-z0-9_-]{43}$/.test(text);
}
