import type { RecordContent } from './record.ts';

// A record's criterion in the engine's notation, for the server's analyses and the browser's
// previews alike (type-only import: islands stay free of the schema library).

/** Engine criterion text for a record's criterion (thresholds in the record's fixed units). */
export function engineCriterion(c: RecordContent['criterion']): string | undefined {
  if (!c) return undefined;
  switch (c.kind) {
    case 's-value':
      return `s:${c.threshold}`;
    case 'ce':
      return `ce:${c.threshold}%`;
    case 'j-area':
      return `j:${c.threshold}uA/cm2`;
    case 'j-mass':
      return `jm:${c.threshold}mA/g`;
    case 'hold-leakage':
      return c.per === 'area' ? `j:${c.threshold}uA/cm2` : `jm:${c.threshold}mA/g`;
  }
}
