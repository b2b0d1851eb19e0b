// The electrolytes of the scenario with their model onsets (V vs SHE on glassy carbon at 25 °C,
// where the faradaic current density reaches the model's onset value). Invented model values in
// the usual order of stability: ionic liquids and nitriles widest anodically, ethers oxidise
// first, carbonates reduce early; lithium and sodium values are set on their metal scales
// (Li⁺/Li −3.040 V, Na⁺/Na −2.71 V vs SHE, docs/methods.md §4) and moved to SHE here.
// Aqueous electrolytes carry no onsets: water's lines and each electrode's kinetics place them
// (physics.ts).
import type { ElectrolyteSystem } from './physics.ts';

const LI = -3.04;
const NA = -2.71;

const organic = (
  key: string,
  label: string,
  family: ElectrolyteSystem['family'],
  electrolyte: ElectrolyteSystem['electrolyte'],
  anodicSheV: number,
  cathodicSheV: number,
  restSheV: number,
  slopes: { anodic: number; cathodic: number },
  passivatesAluminium = false,
): ElectrolyteSystem => ({
  key,
  label,
  family,
  electrolyte,
  anodicSheV,
  cathodicSheV,
  restSheV,
  slopes,
  passivatesAluminium,
});

const one = (term: string) => [{ term, fraction: 1, fractionBasis: 'volume' as const }];
const mixed = (a: string, b: string) => [
  { term: a, fraction: 0.5, fractionBasis: 'volume' as const },
  { term: b, fraction: 0.5, fractionBasis: 'volume' as const },
];
const molar = (term: string, value: number) => ({
  term,
  concentration: { value, basis: 'mol/L' as const },
});
const molal = (term: string, value: number) => ({
  term,
  concentration: { value, basis: 'mol/kg' as const },
});
const neat = (term: string) => ({
  term,
  concentration: { value: 1, basis: 'mole fraction' as const },
});

const aqueous = (
  key: string,
  label: string,
  salt: { term: string; concentration: { value: number; basis: 'mol/L' | 'mol/kg' } },
  pH: number,
  molality?: number,
): ElectrolyteSystem => ({
  key,
  label,
  family: 'aqueous',
  electrolyte: { solvents: one('water'), salts: [salt], pH },
  ...(molality !== undefined ? { molality } : {}),
});

const QA = { anodic: 0.16, cathodic: 0.18 };
const LIB = { anodic: 0.2, cathodic: 0.15 };
const IL = { anodic: 0.2, cathodic: 0.2 };

export const SYSTEMS = {
  // quaternary ammonium salts in nitrile and carbonate: the supercapacitor electrolytes
  acnTeabf4: organic(
    'acn-teabf4',
    '1 M TEABF4 in acetonitrile',
    'nitrile',
    { solvents: one('ACN'), salts: [molar('TEABF4', 1)], waterContentPpm: 20 },
    1.65,
    -2.45,
    0.2,
    QA,
    true,
  ),
  pcTeabf4: organic(
    'pc-teabf4',
    '1 M TEABF4 in propylene carbonate',
    'carbonate',
    { solvents: one('PC'), salts: [molar('TEABF4', 1)], waterContentPpm: 25 },
    1.75,
    -2.4,
    0.2,
    QA,
    true,
  ),
  acnSbpbf4: organic(
    'acn-sbpbf4',
    '1.5 M SBPBF4 in acetonitrile',
    'nitrile',
    { solvents: one('ACN'), salts: [molar('SBPBF4', 1.5)], waterContentPpm: 20 },
    1.7,
    -2.5,
    0.2,
    QA,
    true,
  ),
  // lithium and sodium battery electrolytes
  ecdmcLipf6: organic(
    'ecdmc-lipf6',
    '1 M LiPF6 in EC:DMC (1:1 v/v)',
    'carbonate',
    { solvents: mixed('EC', 'DMC'), salts: [molar('LiPF6', 1)], waterContentPpm: 15 },
    LI + 4.6,
    LI + 1.0,
    LI + 3.0,
    LIB,
    true,
  ),
  ecdmcLitfsi: organic(
    'ecdmc-litfsi',
    '1 M LiTFSI in EC:DMC (1:1 v/v)',
    'carbonate',
    { solvents: mixed('EC', 'DMC'), salts: [molar('LiTFSI', 1)], waterContentPpm: 15 },
    LI + 4.7,
    LI + 1.0,
    LI + 3.0,
    LIB,
  ),
  pcLipf6: organic(
    'pc-lipf6',
    '1 M LiPF6 in PC',
    'carbonate',
    { solvents: one('PC'), salts: [molar('LiPF6', 1)], waterContentPpm: 20 },
    LI + 4.55,
    LI + 0.9,
    LI + 3.0,
    LIB,
    true,
  ),
  etherLitfsi: organic(
    'ether-litfsi',
    '1 M LiTFSI in DME:DOL (1:1 v/v)',
    'ether',
    { solvents: mixed('DME', 'DOL'), salts: [molar('LiTFSI', 1)], waterContentPpm: 10 },
    LI + 4.05,
    LI + 0.35,
    LI + 2.9,
    { anodic: 0.15, cathodic: 0.15 },
  ),
  tegdmeLitfsi: organic(
    'tegdme-litfsi',
    '1 M LiTFSI in TEGDME',
    'ether',
    { solvents: one('TEGDME'), salts: [molar('LiTFSI', 1)], waterContentPpm: 10 },
    LI + 4.15,
    LI + 0.4,
    LI + 2.9,
    { anodic: 0.15, cathodic: 0.15 },
  ),
  dmeNapf6: organic(
    'dme-napf6',
    '1 M NaPF6 in DME',
    'ether',
    { solvents: one('DME'), salts: [molar('NaPF6', 1)], waterContentPpm: 10 },
    NA + 3.9,
    NA + 0.3,
    NA + 2.6,
    { anodic: 0.15, cathodic: 0.15 },
    true,
  ),
  pcNaclo4: organic(
    'pc-naclo4',
    '1 M NaClO4 in PC',
    'carbonate',
    { solvents: one('PC'), salts: [molar('NaClO4', 1)], waterContentPpm: 30 },
    NA + 4.5,
    NA + 0.6,
    NA + 2.8,
    LIB,
  ),
  dmsoLitfsi: organic(
    'dmso-litfsi',
    '1 M LiTFSI in DMSO',
    'sulfoxide',
    { solvents: one('DMSO'), salts: [molar('LiTFSI', 1)], waterContentPpm: 30 },
    LI + 4.25,
    LI + 1.0,
    LI + 3.0,
    { anodic: 0.17, cathodic: 0.15 },
  ),
  dmsoNaclo4: organic(
    'dmso-naclo4',
    '1 M NaClO4 in DMSO',
    'sulfoxide',
    { solvents: one('DMSO'), salts: [molar('NaClO4', 1)], waterContentPpm: 30 },
    NA + 4.0,
    NA + 0.8,
    NA + 2.8,
    { anodic: 0.17, cathodic: 0.15 },
  ),
  adnLitfsi: organic(
    'adn-litfsi',
    '1 M LiTFSI in adiponitrile',
    'nitrile',
    { solvents: one('ADN'), salts: [molar('LiTFSI', 1)], waterContentPpm: 20 },
    LI + 5.2,
    LI + 1.2,
    LI + 3.0,
    LIB,
  ),
  // ionic liquids, neat or with a lithium salt
  emimbf4: organic(
    'emimbf4',
    'EMImBF4 (neat)',
    'ionic-liquid',
    { solvents: [], salts: [neat('EMImBF4')], waterContentPpm: 50 },
    1.95,
    -2.3,
    0.1,
    IL,
    true,
  ),
  emimtfsi: organic(
    'emimtfsi',
    'EMImTFSI (neat)',
    'ionic-liquid',
    { solvents: [], salts: [neat('EMImTFSI')], waterContentPpm: 40 },
    2.05,
    -2.25,
    0.1,
    IL,
  ),
  liEmimtfsi: organic(
    'li-emimtfsi',
    '0.5 mol/kg LiTFSI in EMImTFSI',
    'ionic-liquid',
    {
      solvents: [],
      salts: [
        molal('LiTFSI', 0.5),
        { term: 'EMImTFSI', concentration: { value: 0.9, basis: 'mole fraction' } },
      ],
      waterContentPpm: 40,
    },
    2.0,
    LI + 0.9,
    LI + 3.0,
    IL,
  ),
  // water: neutral, acidic, alkaline, and concentrated
  na2so4: aqueous('na2so4', '0.5 M Na2SO4 (aq)', molar('Na2SO4', 0.5), 6.5),
  li2so4: aqueous('li2so4', '1 M Li2SO4 (aq)', molar('Li2SO4', 1), 7),
  k2so4pH3: aqueous('k2so4-ph3', '0.5 M K2SO4 (aq), pH 3', molar('K2SO4', 0.5), 3),
  k2so4pH7: aqueous('k2so4-ph7', '0.5 M K2SO4 (aq), pH 7', molar('K2SO4', 0.5), 7),
  k2so4pH11: aqueous('k2so4-ph11', '0.5 M K2SO4 (aq), pH 11', molar('K2SO4', 0.5), 11),
  h2so4: aqueous('h2so4', '0.5 M H2SO4 (aq)', molar('H2SO4', 0.5), 0.3),
  koh: aqueous('koh', '1 M KOH (aq)', molar('KOH', 1), 14),
  koh6: aqueous('koh6', '6 M KOH (aq)', molar('KOH', 6), 14.7),
  litfsiAq1: aqueous('litfsi-aq-1', '1 mol/kg LiTFSI (aq)', molal('LiTFSI', 1), 7, 1),
  litfsiAq5: aqueous('litfsi-aq-5', '5 mol/kg LiTFSI (aq)', molal('LiTFSI', 5), 7, 5),
  litfsiAq21: aqueous(
    'litfsi-aq-21',
    '21 mol/kg LiTFSI (aq), water-in-salt',
    molal('LiTFSI', 21),
    7,
    21,
  ),
  naclo4Aq1: aqueous('naclo4-aq-1', '1 mol/kg NaClO4 (aq)', molal('NaClO4', 1), 7, 1),
  naclo4Aq17: aqueous(
    'naclo4-aq-17',
    '17 mol/kg NaClO4 (aq), water-in-salt',
    molal('NaClO4', 17),
    7,
    17,
  ),
  lino3Aq5: aqueous('lino3-aq-5', '5 mol/kg LiNO3 (aq)', molal('LiNO3', 5), 7, 5),
} satisfies Record<string, ElectrolyteSystem>;

export type SystemKey = keyof typeof SYSTEMS;
