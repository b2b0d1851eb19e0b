import type { AnalysisOptions } from '#lib/analysis/analyze.ts';
import { engineCriterion } from './criteria.ts';
import type { RecordContent } from './record.ts';

// A record's conditions and one file's column mapping as the engine's options: the same function
// for the browser's preview and for the analyses the server stores, so the two never read a file
// differently. Limits stay on the file's own scale here; the server adds the conversion to its
// curated reference scale (`fromRef` and the conditions it needs).

export const ENGINE_METHOD = {
  'cv-window-opening': 'cv',
  lsv: 'lsv',
  'potentiostatic-holds': 'hold',
} as const satisfies Record<RecordContent['method']['kind'], AnalysisOptions['method']>;

/** How a raw file's columns are read, as its upload stored it. */
export interface FileMapping {
  columns?: AnalysisOptions['columns'];
  sign?: 'iupac' | 'opposite';
  direction?: 'anodic' | 'cathodic';
  /** CV: vertices closer than this (V) are one vertex; absent, the engine finds it from the data. */
  vertexToleranceV?: number;
}

/** The engine options for a raw file of a record, on the file's own potential scale. */
export function engineOptions(content: RecordContent, mapping: FileMapping): AnalysisOptions {
  const m = content.method;
  const o: AnalysisOptions = { method: ENGINE_METHOD[m.kind] };
  // A two-electrode cell's voltages are never converted; the engine refuses it and says so.
  if (content.cellType === 'two-electrode') o.cell = 'two-electrode';
  const criterion = engineCriterion(content.criterion);
  if (criterion) o.criterion = criterion;
  if (m.kind !== 'potentiostatic-holds' && m.scanRateMVs !== undefined)
    o.scanRate = m.scanRateMVs / 1000;
  if (content.workingElectrode.geometricAreaCm2 !== undefined)
    o.area = content.workingElectrode.geometricAreaCm2;
  if (content.workingElectrode.activeMassMg !== undefined)
    o.mass = content.workingElectrode.activeMassMg / 1000;
  if (mapping.columns && Object.keys(mapping.columns).length > 0) o.columns = mapping.columns;
  if (mapping.sign) o.sign = mapping.sign;
  if (mapping.direction) o.direction = mapping.direction;
  if (mapping.vertexToleranceV !== undefined && o.method === 'cv')
    o.vertexToleranceV = mapping.vertexToleranceV;
  return o;
}
