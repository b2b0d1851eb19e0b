import bcrypt from 'bcryptjs';

// Password rules and hashing. bcrypt (cost 12) reads at most 72 bytes of its input and would
// silently ignore the rest, so longer passwords are refused rather than truncated; the byte
// count is of the NFC-normalised UTF-8 text, the form that is hashed.

export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_BYTES = 72;
export const BCRYPT_COST = 12;

// A short list of passwords that meet the length rule yet are among the first an attacker tries.
const COMMON = new Set([
  '123456789012',
  '1234567890123',
  '12345678901234',
  '123456789012345',
  '1234567890123456',
  '111111111111',
  '000000000000',
  '123123123123',
  '121212121212',
  '987654321098',
  'password1234',
  'password12345',
  'password123!',
  'passwordpassword',
  'password1234!',
  'qwertyuiopas',
  'qwerty123456',
  'qwertyqwerty',
  '1q2w3e4r5t6y',
  'q1w2e3r4t5y6',
  'qwertyuiop12',
  'asdfghjkl123',
  'zxcvbnm12345',
  'abcdefghijkl',
  'abc123abc123',
  'iloveyou1234',
  'letmein12345',
  'welcome12345',
  'welcome123456',
  'administrator',
  'admin1234567',
  'changeme1234',
  'trustno11234',
  'football1234',
  'baseball1234',
  'sunshine1234',
  'princess1234',
  'monkey123456',
  'dragon123456',
  'starwars1234',
  'superman1234',
  'michael12345',
  'computer1234',
  'internet1234',
  'p@ssw0rd1234',
  'passw0rd1234',
  'mypassword12',
  'secret123456',
  'edgewise1234',
  'edgewise2026',
]);

/** Why a password is not acceptable, or null when it is. */
export function passwordProblem(password: string, context: { email?: string } = {}): string | null {
  const normalised = password.normalize('NFC');
  if ([...normalised].length < MIN_PASSWORD_LENGTH)
    return `must be at least ${MIN_PASSWORD_LENGTH} characters`;
  if (Buffer.byteLength(normalised, 'utf8') > MAX_PASSWORD_BYTES)
    return `must be at most ${MAX_PASSWORD_BYTES} bytes (about ${MAX_PASSWORD_BYTES} letters without accents)`;
  if (normalised.includes('\0')) return 'must not contain a NUL character';
  const lower = normalised.toLowerCase();
  if (COMMON.has(lower)) return 'is too common; choose another';
  if (/^(.)\1+$/u.test(normalised)) return 'must not be one character repeated';
  const local = context.email?.split('@')[0]?.toLowerCase();
  if (local && local.length >= 4 && lower.includes(local))
    return 'must not contain your e-mail address';
  return null;
}

/** bcrypt hash of an acceptable password; throws when the rules refuse it. */
export async function hashPassword(password: string): Promise<string> {
  const problem = passwordProblem(password);
  if (problem) throw new Error(`password ${problem}`);
  return bcrypt.hash(password.normalize('NFC'), BCRYPT_COST);
}

/** Constant-time comparison against a stored hash; false for anything over the byte limit. */
export async function verifyPassword(password: string, hash: string): Promise<boolean> {
  const normalised = password.normalize('NFC');
  if (Buffer.byteLength(normalised, 'utf8') > MAX_PASSWORD_BYTES) return false;
  return bcrypt.compare(normalised, hash);
}

// Compared against when the account does not exist, so both cases take the same time.
let dummy: Promise<string> | undefined;
export async function burnPasswordCheck(password: string): Promise<void> {
  dummy ??= bcrypt.hash('not-a-real-password-for-timing', BCRYPT_COST);
  await bcrypt.compare(password.slice(0, 72), await dummy);
}
