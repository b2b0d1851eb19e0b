import { expect } from 'vitest';

/** Half a unit in the last place of a value written as text ("0.1164" → 5e-5, "6.257e-3" → 5e-7). */
export function halfUlp(given: string): number {
  const [mant, exp] = given.toLowerCase().split('e') as [string, string | undefined];
  const dot = mant.indexOf('.');
  const decimals = dot < 0 ? 0 : mant.length - dot - 1;
  return 0.5 * 10 ** (-decimals + (exp ? Number(exp) : 0));
}

/** Tolerance used for check values: the value must round to the digits given (|x − given| ≤ ½ unit in the last place). */
export function expectToDigits(actual: number | null | undefined, given: string): void {
  expect(actual, `expected a number close to ${given}`).toBeTypeOf('number');
  const tol = halfUlp(given) * (1 + 1e-9);
  expect(
    Math.abs((actual as number) - Number(given)),
    `${actual} should round to ${given} (±${halfUlp(given)})`,
  ).toBeLessThanOrEqual(tol);
}
