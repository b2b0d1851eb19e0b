// The words for the fields of a record's content, for curators' comments, differences between
// versions and the contributor's view of those comments: one list, so every screen names a field
// the same way and no one reads a JSON path.

import type { MethodKind, RecordContent } from './record.ts';

/** Each method of measuring a window in words. */
export const METHOD_NAMES: Record<MethodKind, string> = {
  'cv-window-opening': 'CV window opening',
  lsv: 'linear sweep',
  'potentiostatic-holds': 'potentiostatic holds',
};

/** A method with its settings in words: "CV window opening, 5 mV s⁻¹, vertex step 100 mV". */
export function methodWords(m: RecordContent['method']): string {
  return [
    METHOD_NAMES[m.kind],
    m.kind !== 'potentiostatic-holds' && m.scanRateMVs !== undefined
      ? `${m.scanRateMVs} mV s⁻¹`
      : '',
    m.kind === 'cv-window-opening' && m.vertexStepMV !== undefined
      ? `vertex step ${m.vertexStepMV} mV`
      : '',
    m.kind === 'potentiostatic-holds' && m.stepMV !== undefined ? `step ${m.stepMV} mV` : '',
    m.kind === 'potentiostatic-holds' && m.holdTimeS !== undefined ? `hold ${m.holdTimeS} s` : '',
  ]
    .filter(Boolean)
    .join(', ');
}

const LABELS: Record<string, string> = {
  title: 'Title',
  electrolyte: 'Electrolyte',
  'electrolyte.solvents': 'Solvents',
  'electrolyte.salts': 'Salts',
  'electrolyte.additives': 'Additives',
  'electrolyte.waterContentPpm': 'Water content',
  'electrolyte.pH': 'pH',
  temperatureC: 'Temperature',
  workingElectrode: 'Working electrode',
  'workingElectrode.material': 'Working electrode material',
  'workingElectrode.form': 'Working electrode form',
  'workingElectrode.geometricAreaCm2': 'Geometric area',
  'workingElectrode.activeMassMg': 'Active mass',
  counterElectrode: 'Counter electrode',
  'counterElectrode.material': 'Counter electrode',
  referenceElectrode: 'Reference electrode',
  cellType: 'Cell',
  method: 'Method',
  'method.kind': 'Method',
  'method.scanRateMVs': 'Scan rate',
  'method.vertexStepMV': 'Vertex step',
  'method.stepMV': 'Hold step',
  'method.holdTimeS': 'Hold time',
  criterion: 'Criterion',
  'criterion.threshold': 'Criterion threshold',
  reportedLimits: 'Reported limits',
  'reportedLimits.cathodic': 'Reported cathodic limit',
  'reportedLimits.anodic': 'Reported anodic limit',
  source: 'Source',
  'source.doi': 'Source DOI',
  'source.title': 'Source title',
  'source.authors': 'Source authors',
  'source.year': 'Source year',
  licence: 'Licence',
  visibility: 'Visibility',
  embargoUntil: 'Embargo until',
  notes: 'Notes',
  rawFiles: 'Raw files',
  evidenceLevel: 'Evidence level',
};

const PART_WORDS: Record<string, string> = {
  valueV: 'value',
  term: 'name',
  fractionBasis: 'fraction basis',
};

/** A content path (`electrolyte.salts.0.concentration.value`) in words ("Salts: no. 1, concentration, value"). */
export function pathLabel(path: string): string {
  const parts = path.split('.');
  for (let i = parts.length; i > 0; i--) {
    const label = LABELS[parts.slice(0, i).join('.')];
    if (!label) continue;
    const rest = parts
      .slice(i)
      .map((x) =>
        /^\d+$/.test(x)
          ? `no. ${Number(x) + 1}`
          : (PART_WORDS[x] ?? x.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase()),
      );
    return rest.length ? `${label}: ${rest.join(', ')}` : label;
  }
  return path;
}
