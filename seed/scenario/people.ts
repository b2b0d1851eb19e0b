// The invented consortium: three labs, the people in them and around them, and the invented
// literature the "stated" records cite. Nobody and nothing here is real; e-mail domains end in
// .test (reserved, never delivered) and DOIs use the test prefix 10.5555.
import type { LabRole, Role } from '#lib/shared/principal.ts';

export type LabSlug = 'riverbend-interfaces' | 'northmoor-energy' | 'kestrel-cells';

export interface ScenarioLab {
  slug: LabSlug;
  name: string;
  kind: 'university group' | 'research institute' | 'industrial R&D';
  /** One line for the lab page. */
  about: string;
}

// Same slugs and names as the sign-in seed, so the scenario fills the labs people sign in to.
export const LABS: readonly ScenarioLab[] = [
  {
    slug: 'riverbend-interfaces',
    name: 'Riverbend University Interfaces Group',
    kind: 'university group',
    about:
      'Model electrodes (glassy carbon, platinum, gold) in aqueous and ionic-liquid electrolytes; how the electrode changes the window.',
  },
  {
    slug: 'northmoor-energy',
    name: 'Northmoor Institute for Energy Materials',
    kind: 'research institute',
    about:
      'Lithium and sodium battery electrolytes, current collectors, and concentrated aqueous ("water-in-salt") electrolytes.',
  },
  {
    slug: 'kestrel-cells',
    name: 'Kestrel Cells R&D',
    kind: 'industrial R&D',
    about:
      'Supercapacitor development: activated-carbon electrodes, symmetric cells and float (hold) tests.',
  },
];

export interface ScenarioPerson {
  /** Stable key the records and the story refer to. */
  key: string;
  name: string;
  email: string;
  role: Role;
  affiliation: string;
  labs: [LabSlug, LabRole][];
  /** What the person does in the story (shown on the start page next to the sign-in list). */
  part: string;
}

// The first six are the sign-in accounts of the accounts seed (same e-mails and roles); the rest
// are colleagues who own records, review them or flag them.
export const PEOPLE: readonly ScenarioPerson[] = [
  {
    key: 'admin',
    name: 'Iris Vantongeren',
    email: 'admin@edgewise-demo.test',
    role: 'admin',
    affiliation: 'Edgewise',
    labs: [],
    part: 'runs the service',
  },
  {
    key: 'curator',
    name: 'Tomas Okafor-Lind',
    email: 'curator@edgewise-demo.test',
    role: 'curator',
    affiliation: 'Edgewise',
    labs: [],
    part: 'reviews records, answers flags',
  },
  {
    key: 'riverbend-manager',
    name: 'Jun Aldana',
    email: 'manager@riverbend-interfaces.test',
    role: 'contributor',
    affiliation: 'Riverbend University',
    labs: [['riverbend-interfaces', 'manager']],
    part: 'leads the interfaces group',
  },
  {
    key: 'riverbend-contributor',
    name: 'Mira Halvorsen',
    email: 'contributor@riverbend-interfaces.test',
    role: 'contributor',
    affiliation: 'Riverbend University',
    labs: [['riverbend-interfaces', 'member']],
    part: 'postdoc; model-electrode series',
  },
  {
    key: 'northmoor-manager',
    name: 'Bao Castellanos',
    email: 'contributor@northmoor-energy.test',
    role: 'contributor',
    affiliation: 'Northmoor Institute',
    labs: [['northmoor-energy', 'manager']],
    part: 'heads the electrolyte team',
  },
  {
    key: 'reader',
    name: 'Pell Ravensworth',
    email: 'reader@edgewise-demo.test',
    role: 'reader',
    affiliation: 'Kestrel Cells',
    labs: [],
    part: 'formulator who reads and flags',
  },
  {
    key: 'riverbend-student',
    name: 'Dario Quenneville',
    email: 'dario.quenneville@riverbend-interfaces.test',
    role: 'contributor',
    affiliation: 'Riverbend University',
    labs: [['riverbend-interfaces', 'member']],
    part: 'doctoral student; ionic liquids',
  },
  {
    key: 'northmoor-scientist',
    name: 'Ingrid Sollemare',
    email: 'ingrid.sollemare@northmoor-energy.test',
    role: 'contributor',
    affiliation: 'Northmoor Institute',
    labs: [['northmoor-energy', 'member']],
    part: 'concentrated aqueous electrolytes',
  },
  {
    key: 'northmoor-engineer',
    name: 'Lior Achterberg',
    email: 'lior.achterberg@northmoor-energy.test',
    role: 'contributor',
    affiliation: 'Northmoor Institute',
    labs: [['northmoor-energy', 'member']],
    part: 'current collectors and sodium electrolytes',
  },
  {
    key: 'kestrel-manager',
    name: 'Rosalind Tiwari-Holm',
    email: 'rosalind.tiwari-holm@kestrel-cells.test',
    role: 'contributor',
    affiliation: 'Kestrel Cells',
    labs: [['kestrel-cells', 'manager']],
    part: 'manages the cell R&D team',
  },
  {
    key: 'kestrel-engineer',
    name: 'Emeka Lindqvist',
    email: 'emeka.lindqvist@kestrel-cells.test',
    role: 'contributor',
    affiliation: 'Kestrel Cells',
    labs: [['kestrel-cells', 'member']],
    part: 'runs the float tests and cell windows',
  },
  {
    key: 'curator-2',
    name: 'Saskia Oyelaran',
    email: 'saskia.oyelaran@edgewise-demo.test',
    role: 'curator',
    affiliation: 'Edgewise',
    labs: [],
    part: 'curator for aqueous and ionic-liquid records',
  },
  {
    key: 'reader-2',
    name: 'Noor Abernethy',
    email: 'noor.abernethy@haldenworks.test',
    role: 'reader',
    affiliation: 'Halden Capacitor Works',
    labs: [],
    part: 'reader comparing windows for a new cell',
  },
];

export type PersonKey = (typeof PEOPLE)[number]['key'];

// ---- the invented literature ----

export const JOURNALS = [
  { title: 'Annals of Applied Interphases', abbrev: 'Ann. Appl. Interphases' },
  { title: 'Fenwick Electrochemical Transactions', abbrev: 'Fenwick Electrochem. Trans.' },
  { title: 'Letters in Electrolyte Engineering', abbrev: 'Lett. Electrolyte Eng.' },
  { title: 'Capacitor Science Quarterly', abbrev: 'Capacitor Sci. Q.' },
] as const;

// Given and family names combined at random for invented authors.
export const GIVEN_NAMES = [
  'Aino',
  'Bastien',
  'Chiara',
  'Dagny',
  'Eero',
  'Farah',
  'Gideon',
  'Hana',
  'Ilse',
  'Joaquim',
  'Kalani',
  'Lucan',
  'Maelis',
  'Nils',
  'Orla',
  'Priya',
  'Quill',
  'Rafe',
  'Sunniva',
  'Tobiah',
] as const;
export const FAMILY_NAMES = [
  'Ardelean',
  'Brightwater',
  'Cosgrave',
  'Drummelin',
  'Eskildsen',
  'Fairlop',
  'Grunnberg',
  'Hollowell',
  'Istvanffy',
  'Jerrold',
  'Kettering-Moss',
  'Lunquist',
  'Marrable',
  'Nethercott',
  'Oakhurst',
  'Pellinore',
  'Quarrington',
  'Rostova-Blake',
  'Silverthorn',
  'Tamblyn',
] as const;

/** Prefix every invented DOI carries (the DOI system's test prefix). */
export const DOI_PREFIX = '10.5555';
