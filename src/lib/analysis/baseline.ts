import { AnalysisError } from './errors';
import { quantileSorted } from './aggregate';

/**
 * A curve's own capacitive current (A): the median |I| over the first `fraction` of its samples in
 * recording order. A window-opening run starts with its narrowest, least faradaic cycles, and a
 * linear sweep starts near rest, so that stretch is mostly double-layer charging; dividing a curve
 * by it puts electrodes of very different areas (nA on a glassy-carbon disk, mA on activated
 * carbon) on one dimensionless axis where faradaic growth shows as a rise above 1.
 */
export function capacitiveCurrentA(current: ArrayLike<number>, fraction = 0.1): number {
  if (!(fraction > 0 && fraction <= 1))
    throw new AnalysisError('bad-option', `fraction must lie in (0, 1], not ${fraction}`);
  const n = Math.max(1, Math.ceil(current.length * fraction));
  const v: number[] = [];
  for (let i = 0; i < Math.min(n, current.length); i++) {
    const x = Math.abs(current[i]!);
    if (Number.isFinite(x)) v.push(x);
  }
  if (v.length === 0)
    throw new AnalysisError('too-few-points', 'no finite current to take a capacitive level from');
  v.sort((a, b) => a - b);
  const level = quantileSorted(v, 0.5);
  if (!(level > 0))
    throw new AnalysisError(
      'bad-option',
      'the capacitive current is zero, so the curve cannot be normalised by it',
    );
  return level;
}
