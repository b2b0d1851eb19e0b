// Valid window-record content for tests and benchmarks (no test-runner imports, so scripts can use it too).
import type { RecordContentInput } from '#lib/shared/record.ts';

/** A documented window-opening CV record in PC / LiPF6 on glassy carbon (invented numbers). */
export function content(over: Partial<RecordContentInput> = {}): RecordContentInput {
  return {
    title: 'Test window',
    electrolyte: {
      solvents: [{ term: 'propylene carbonate', fraction: 1 }],
      salts: [{ term: 'LiPF6', concentration: { value: 1, basis: 'mol/L' } }],
    },
    temperatureC: 25,
    workingElectrode: { material: 'GC', form: 'disk', geometricAreaCm2: 0.07 },
    counterElectrode: { material: 'platinum' },
    referenceElectrode: 'SCE',
    cellType: 'three-electrode',
    method: { kind: 'cv-window-opening', scanRateMVs: 5, vertexStepMV: 100 },
    criterion: { kind: 's-value', threshold: 0.1 },
    reportedLimits: {
      cathodic: { valueV: -2.5, reference: 'SCE' },
      anodic: { valueV: 1.0, reference: 'SCE' },
    },
    source: {
      kind: 'published',
      doi: '10.5555/ew.test.1',
      title: 'An invented window study',
      authors: [{ family: 'Example', given: 'Erin' }],
      containerTitle: 'Journal of Made-up Electrochemistry',
      year: 2024,
      volume: '7',
      pages: '1-9',
    },
    ...over,
  };
}
