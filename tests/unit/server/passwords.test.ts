import { describe, expect, it } from 'vitest';
import {
  hashPassword,
  passwordProblem,
  verifyPassword,
  MAX_PASSWORD_BYTES,
} from '#lib/server/auth/passwords.ts';

describe('password rules', () => {
  it('wants at least 12 characters', () => {
    expect(passwordProblem('short-pass1')).toBe('must be at least 12 characters');
    expect(passwordProblem('twelve-chars')).toBeNull();
  });

  it('counts characters, not bytes, for the minimum', () => {
    expect(passwordProblem('ÅngströmÅng!')).toBeNull(); // 12 characters, more bytes
  });

  it('refuses more than 72 bytes instead of letting bcrypt cut them off', () => {
    expect(passwordProblem('a'.repeat(70) + 'bc')).toBeNull();
    expect(passwordProblem('a'.repeat(71) + 'bc')).toMatch(/at most 72 bytes/);
    // 36 two-byte letters are 72 bytes; one more is too many.
    expect(passwordProblem('é'.repeat(35) + 'xy')).toBeNull();
    expect(passwordProblem('é'.repeat(37))).toMatch(/at most 72 bytes/);
  });

  it('refuses common passwords whatever their case, and one repeated character', () => {
    expect(passwordProblem('password1234')).toBe('is too common; choose another');
    expect(passwordProblem('QWERTY123456')).toBe('is too common; choose another');
    expect(passwordProblem('zzzzzzzzzzzzzzz')).toBe('must not be one character repeated');
  });

  it('refuses a password containing the e-mail name', () => {
    expect(passwordProblem('mira.halvorsen-2026', { email: 'mira.halvorsen@example.test' })).toBe(
      'must not contain your e-mail address',
    );
  });
});

// bcrypt at cost 12 takes ~0.3 s per hash on an idle machine; give slow, busy machines room.
describe('password hashing', { timeout: 60_000 }, () => {
  it('hashes with bcrypt cost 12 and verifies only the same password', async () => {
    const hash = await hashPassword('a calm technical phrase');
    expect(hash).toMatch(/^\$2[aby]\$12\$/);
    expect(await verifyPassword('a calm technical phrase', hash)).toBe(true);
    expect(await verifyPassword('a calm technical phrasE', hash)).toBe(false);
  });

  it('never accepts a longer password that shares the first 72 bytes', async () => {
    const base = 'x'.repeat(MAX_PASSWORD_BYTES - 2) + 'ok';
    const hash = await hashPassword(base);
    expect(await verifyPassword(base + 'anything', hash)).toBe(false);
  });

  it('treats composed and decomposed accents as the same password', async () => {
    const composed = 'café-au-lait-électrode';
    const hash = await hashPassword(composed);
    expect(await verifyPassword(composed.normalize('NFD'), hash)).toBe(true);
  });

  it('refuses to hash a password the rules refuse', async () => {
    await expect(hashPassword('short')).rejects.toThrow(/at least 12/);
  });
});
