// The shapes raw exports come in: each invented instrument writes its own separator, decimal
// mark, units, header style and preamble, and one writes the older current sign. A file that the
// engine cannot read by itself (no header) carries the column mapping a contributor would give.
import {
  formatExport,
  type ExportFormat,
  type ModelSamples,
  type Quantity,
} from '#lib/analysis/index.ts';
import type { ColumnMap } from '#lib/analysis/index.ts';

export interface ExportShape {
  key: string;
  /** Invented instrument or software that writes this shape. */
  instrument: string;
  extension: 'csv' | 'txt' | 'tsv' | 'dat';
  mediaType: 'text/csv' | 'text/plain' | 'text/tab-separated-values';
  format: (kind: 'cv' | 'lsv' | 'hold', meta: string[]) => ExportFormat;
  sign: 'iupac' | 'opposite';
  /** Mapping the uploader gives, for files whose header does not say it all. */
  columns?: (kind: 'cv' | 'lsv' | 'hold') => ColumnMap;
}

const byKind = (kind: 'cv' | 'lsv' | 'hold'): Quantity[] =>
  kind === 'cv'
    ? ['time', 'potential', 'current', 'cycle']
    : kind === 'hold'
      ? ['time', 'step', 'potential', 'current']
      : ['time', 'potential', 'current'];

export const SHAPES: readonly ExportShape[] = [
  {
    key: 'larkspur-csv',
    instrument: 'Larkspur PX-4 potentiostat',
    extension: 'csv',
    mediaType: 'text/csv',
    sign: 'iupac',
    format: (kind, meta) => ({
      separator: ',',
      units: { time: 's', potential: 'V', current: 'A' },
      metadata: meta.map((m) => `# ${m}`),
      columns: byKind(kind),
      significantDigits: 7,
    }),
  },
  {
    key: 'voltaris-semicolon',
    instrument: 'Voltaris Lab 7 (European locale)',
    extension: 'csv',
    mediaType: 'text/csv',
    sign: 'iupac',
    format: (kind, meta) => ({
      separator: ';',
      decimalComma: true,
      headerStyle: 'paren',
      units: { time: 's', potential: 'V', current: 'mA' },
      names: { potential: 'Ewe', current: 'I' },
      metadata: meta,
      columns: byKind(kind),
      significantDigits: 7,
      lineEnding: '\r\n',
    }),
  },
  {
    key: 'quillon-tab',
    instrument: 'Quillon EC-Suite',
    extension: 'txt',
    mediaType: 'text/plain',
    sign: 'iupac',
    format: (kind, meta) => ({
      separator: '\t',
      headerStyle: 'bracket',
      units: { time: 's', potential: 'mV', current: 'µA' },
      names: { current: '<I>', potential: 'E' },
      metadata: meta,
      columns: kind === 'cv' ? ['time', 'potential', 'current'] : byKind(kind),
      significantDigits: 7,
    }),
  },
  {
    key: 'halden-whitespace',
    instrument: 'HaldenLog 2 (fixed-width text)',
    extension: 'dat',
    mediaType: 'text/plain',
    sign: 'iupac',
    format: (kind) => ({
      separator: ' ',
      units: { time: 'min', potential: 'V', current: 'mA' },
      names: { time: 't', potential: 'E', current: 'I' },
      columns: kind === 'hold' ? ['time', 'potential', 'current'] : byKind(kind),
      significantDigits: 8,
    }),
  },
  {
    // An older instrument: cathodic current positive. Declared in the upload mapping.
    key: 'ferrant-legacy',
    instrument: 'Ferrant 1986-compatible logger (cathodic current positive)',
    extension: 'csv',
    mediaType: 'text/csv',
    sign: 'opposite',
    format: (kind, meta) => ({
      separator: ',',
      units: { time: 's', potential: 'V', current: 'mA' },
      headerStyle: 'bracket',
      names: { potential: 'Potential', current: 'Current' },
      metadata: [...meta.map((m) => `; ${m}`), '; current sign: cathodic positive'],
      columns: byKind(kind),
      significantDigits: 7,
      bom: true,
    }),
  },
  {
    // No header at all: the contributor maps columns by position and says the units.
    key: 'bare-columns',
    instrument: 'in-house LabVIEW logger',
    extension: 'tsv',
    mediaType: 'text/tab-separated-values',
    sign: 'iupac',
    format: (kind) => ({
      separator: '\t',
      header: false,
      units: { time: 's', potential: 'V', current: 'uA' },
      columns: byKind(kind),
      significantDigits: 7,
    }),
    columns: (kind) => {
      const cols = byKind(kind);
      const map: ColumnMap = {};
      cols.forEach((q, i) => {
        map[q] =
          q === 'time'
            ? { column: i, unit: 's' }
            : q === 'potential'
              ? { column: i, unit: 'V' }
              : q === 'current'
                ? { column: i, unit: 'uA' }
                : { column: i };
      });
      return map;
    },
  },
];

/** Writes samples in a shape. */
export function writeExport(
  samples: ModelSamples,
  shape: ExportShape,
  kind: 'cv' | 'lsv' | 'hold',
  meta: string[],
): string {
  return formatExport(samples, { ...shape.format(kind, meta), sign: shape.sign });
}
