// ORCID iDs: 16 characters in four groups, the last a check character computed with
// ISO 7064 MOD 11-2 over the first 15 digits (X stands for 10).

const SHAPE = /^(\d{4})-?(\d{4})-?(\d{4})-?(\d{3}[\dX])$/;

/** The check character (0–9 or X) for a string of base digits. */
export function orcidCheckCharacter(baseDigits: string): string {
  let total = 0;
  for (const ch of baseDigits) {
    if (ch < '0' || ch > '9') throw new Error(`not a digit: ${ch}`);
    total = (total + Number(ch)) * 2;
  }
  const result = (12 - (total % 11)) % 11;
  return result === 10 ? 'X' : String(result);
}

/**
 * Normalises an ORCID iD (bare, hyphenated, or as an orcid.org URL; lower-case x accepted) to
 * `0000-0000-0000-000X`; null when its shape or check character is wrong.
 */
export function normaliseOrcid(input: string): string | null {
  const bare = input
    .trim()
    .replace(/^https?:\/\/(www\.)?orcid\.org\//i, '')
    .toUpperCase();
  const m = SHAPE.exec(bare);
  if (!m) return null;
  const digits = `${m[1]}${m[2]}${m[3]}${m[4]}`;
  if (orcidCheckCharacter(digits.slice(0, 15)) !== digits[15]) return null;
  return `${m[1]}-${m[2]}-${m[3]}-${m[4]}`;
}
