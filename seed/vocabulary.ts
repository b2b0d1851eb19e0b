import type { VocabularyTermInput } from '../src/lib/shared/vocabulary.ts';

// The starting vocabulary: common solvents, salts, additives, electrode materials, separators and
// reference electrodes. Reference potentials are those of METHODS.md §4 (25 °C, V vs SHE), each
// with its source; `scale` is the analysis engine's id for the same electrode, so conversions use
// the engine's table. Temperature coefficients are left empty until a sourced value is added.

const solvents: VocabularyTermInput[] = [
  { id: 'water', kind: 'solvent', name: 'water', abbreviations: ['H2O'], synonyms: ['aqueous', 'deionised water', 'deionized water'], formula: 'H2O', smiles: 'O' },
  { id: 'pc', kind: 'solvent', name: 'propylene carbonate', abbreviations: ['PC'], synonyms: ['4-methyl-1,3-dioxolan-2-one', '1,2-propanediol cyclic carbonate'], formula: 'C4H6O3', smiles: 'CC1COC(=O)O1' },
  { id: 'ec', kind: 'solvent', name: 'ethylene carbonate', abbreviations: ['EC'], synonyms: ['1,3-dioxolan-2-one'], formula: 'C3H4O3', smiles: 'O=C1OCCO1' },
  { id: 'dmc', kind: 'solvent', name: 'dimethyl carbonate', abbreviations: ['DMC'], synonyms: ['methyl carbonate'], formula: 'C3H6O3', smiles: 'COC(=O)OC' },
  { id: 'dec', kind: 'solvent', name: 'diethyl carbonate', abbreviations: ['DEC'], synonyms: ['ethyl carbonate'], formula: 'C5H10O3', smiles: 'CCOC(=O)OCC' },
  { id: 'emc', kind: 'solvent', name: 'ethyl methyl carbonate', abbreviations: ['EMC'], synonyms: ['methyl ethyl carbonate', 'MEC'], formula: 'C4H8O3', smiles: 'CCOC(=O)OC' },
  { id: 'acn', kind: 'solvent', name: 'acetonitrile', abbreviations: ['ACN', 'AN', 'MeCN'], synonyms: ['methyl cyanide', 'ethanenitrile'], formula: 'C2H3N', smiles: 'CC#N' },
  { id: 'dme', kind: 'solvent', name: '1,2-dimethoxyethane', abbreviations: ['DME'], synonyms: ['monoglyme', 'glyme', 'ethylene glycol dimethyl ether'], formula: 'C4H10O2', smiles: 'COCCOC' },
  { id: 'dol', kind: 'solvent', name: '1,3-dioxolane', abbreviations: ['DOL', 'DIOX'], synonyms: ['dioxolane'], formula: 'C3H6O2', smiles: 'C1COCO1' },
  { id: 'tegdme', kind: 'solvent', name: 'tetraethylene glycol dimethyl ether', abbreviations: ['TEGDME', 'G4'], synonyms: ['tetraglyme'], formula: 'C10H22O5', smiles: 'COCCOCCOCCOCCOC' },
  { id: 'gbl', kind: 'solvent', name: 'γ-butyrolactone', abbreviations: ['GBL'], synonyms: ['gamma-butyrolactone', 'oxolan-2-one'], formula: 'C4H6O2', smiles: 'O=C1CCCO1' },
  { id: 'dmso', kind: 'solvent', name: 'dimethyl sulfoxide', abbreviations: ['DMSO'], synonyms: ['methylsulfinylmethane', 'dimethyl sulphoxide'], formula: 'C2H6OS', smiles: 'CS(C)=O' },
  { id: 'sulfolane', kind: 'solvent', name: 'sulfolane', abbreviations: ['TMS', 'SL'], synonyms: ['tetramethylene sulfone', 'thiolane 1,1-dioxide'], formula: 'C4H8O2S', smiles: 'O=S1(=O)CCCC1' },
  { id: 'adn', kind: 'solvent', name: 'adiponitrile', abbreviations: ['ADN'], synonyms: ['hexanedinitrile'], formula: 'C6H8N2', smiles: 'N#CCCCCC#N' },
];

const salts: VocabularyTermInput[] = [
  { id: 'lipf6', kind: 'salt', name: 'lithium hexafluorophosphate', abbreviations: ['LiPF6'], synonyms: ['LiPF₆'], formula: 'LiPF6' },
  { id: 'litfsi', kind: 'salt', name: 'lithium bis(trifluoromethanesulfonyl)imide', abbreviations: ['LiTFSI', 'LiNTf2'], synonyms: ['LiN(SO2CF3)2', 'lithium bistriflimide'], formula: 'C2F6LiNO4S2' },
  { id: 'lifsi', kind: 'salt', name: 'lithium bis(fluorosulfonyl)imide', abbreviations: ['LiFSI'], synonyms: ['LiN(SO2F)2'], formula: 'F2LiNO4S2' },
  { id: 'libf4', kind: 'salt', name: 'lithium tetrafluoroborate', abbreviations: ['LiBF4'], synonyms: ['LiBF₄'], formula: 'LiBF4' },
  { id: 'liclo4', kind: 'salt', name: 'lithium perchlorate', abbreviations: ['LiClO4'], synonyms: ['LiClO₄'], formula: 'LiClO4' },
  { id: 'lino3', kind: 'salt', name: 'lithium nitrate', abbreviations: ['LiNO3'], synonyms: [], formula: 'LiNO3' },
  { id: 'li2so4', kind: 'salt', name: 'lithium sulfate', abbreviations: ['Li2SO4'], synonyms: ['lithium sulphate'], formula: 'Li2SO4' },
  { id: 'naclo4', kind: 'salt', name: 'sodium perchlorate', abbreviations: ['NaClO4'], synonyms: [], formula: 'NaClO4' },
  { id: 'napf6', kind: 'salt', name: 'sodium hexafluorophosphate', abbreviations: ['NaPF6'], synonyms: [], formula: 'NaPF6' },
  { id: 'na2so4', kind: 'salt', name: 'sodium sulfate', abbreviations: ['Na2SO4'], synonyms: ['sodium sulphate'], formula: 'Na2SO4' },
  { id: 'nacl', kind: 'salt', name: 'sodium chloride', abbreviations: ['NaCl'], synonyms: ['table salt'], formula: 'NaCl' },
  { id: 'k2so4', kind: 'salt', name: 'potassium sulfate', abbreviations: ['K2SO4'], synonyms: ['potassium sulphate'], formula: 'K2SO4' },
  { id: 'kcl', kind: 'salt', name: 'potassium chloride', abbreviations: ['KCl'], synonyms: [], formula: 'KCl' },
  { id: 'koh', kind: 'salt', name: 'potassium hydroxide', abbreviations: ['KOH'], synonyms: ['caustic potash'], formula: 'KOH' },
  { id: 'naoh', kind: 'salt', name: 'sodium hydroxide', abbreviations: ['NaOH'], synonyms: ['caustic soda'], formula: 'NaOH' },
  { id: 'h2so4', kind: 'salt', name: 'sulfuric acid', abbreviations: ['H2SO4'], synonyms: ['sulphuric acid'], formula: 'H2SO4' },
  { id: 'teabf4', kind: 'salt', name: 'tetraethylammonium tetrafluoroborate', abbreviations: ['TEABF4', 'Et4NBF4'], synonyms: ['TEA BF4', 'TEA-BF4'], formula: 'C8H20BF4N' },
  { id: 'sbpbf4', kind: 'salt', name: "spiro-(1,1')-bipyrrolidinium tetrafluoroborate", abbreviations: ['SBPBF4', 'SBP-BF4'], synonyms: ['spirobipyrrolidinium tetrafluoroborate'], formula: 'C8H16BF4N' },
  { id: 'emimbf4', kind: 'salt', name: '1-ethyl-3-methylimidazolium tetrafluoroborate', abbreviations: ['EMImBF4', 'EMIBF4'], synonyms: ['[EMIM][BF4]', 'EMIM BF4'], formula: 'C6H11BF4N2' },
  { id: 'emimtfsi', kind: 'salt', name: '1-ethyl-3-methylimidazolium bis(trifluoromethanesulfonyl)imide', abbreviations: ['EMImTFSI', 'EMITFSI'], synonyms: ['[EMIM][TFSI]', 'EMIM TFSI'], formula: 'C8H11F6N3O4S2' },
  { id: 'znso4', kind: 'salt', name: 'zinc sulfate', abbreviations: ['ZnSO4'], synonyms: ['zinc sulphate'], formula: 'ZnSO4' },
  { id: 'zn-otf2', kind: 'salt', name: 'zinc trifluoromethanesulfonate', abbreviations: ['Zn(OTf)2'], synonyms: ['zinc triflate', 'Zn(CF3SO3)2'], formula: 'C2F6O6S2Zn' },
  { id: 'mg-tfsi2', kind: 'salt', name: 'magnesium bis(trifluoromethanesulfonyl)imide', abbreviations: ['Mg(TFSI)2'], synonyms: ['magnesium bistriflimide'], formula: 'C4F12MgN2O8S4' },
];

const additives: VocabularyTermInput[] = [
  { id: 'fec', kind: 'additive', name: 'fluoroethylene carbonate', abbreviations: ['FEC'], synonyms: ['4-fluoro-1,3-dioxolan-2-one'], formula: 'C3H3FO3', smiles: 'O=C1OCC(F)O1' },
  { id: 'vc', kind: 'additive', name: 'vinylene carbonate', abbreviations: ['VC'], synonyms: ['1,3-dioxol-2-one'], formula: 'C3H2O3', smiles: 'O=C1OC=CO1' },
  { id: 'ps', kind: 'additive', name: '1,3-propane sultone', abbreviations: ['PS'], synonyms: ['1,2-oxathiolane 2,2-dioxide'], formula: 'C3H6O3S', smiles: 'O=S1(=O)CCCO1' },
  { id: 'lidfob', kind: 'additive', name: 'lithium difluoro(oxalato)borate', abbreviations: ['LiDFOB', 'LiODFB'], synonyms: [], formula: 'C2BF2LiO4' },
];

const electrodes: VocabularyTermInput[] = [
  { id: 'glassy-carbon', kind: 'electrode-material', name: 'glassy carbon', abbreviations: ['GC'], synonyms: ['vitreous carbon'] },
  { id: 'platinum', kind: 'electrode-material', name: 'platinum', abbreviations: ['Pt'], synonyms: [] },
  { id: 'gold', kind: 'electrode-material', name: 'gold', abbreviations: ['Au'], synonyms: [] },
  { id: 'activated-carbon', kind: 'electrode-material', name: 'activated carbon', abbreviations: ['AC'], synonyms: ['active carbon', 'activated charcoal'] },
  { id: 'stainless-steel', kind: 'electrode-material', name: 'stainless steel', abbreviations: ['SS'], synonyms: ['316L stainless steel', 'SUS'] },
  { id: 'aluminium', kind: 'electrode-material', name: 'aluminium', abbreviations: ['Al'], synonyms: ['aluminum', 'aluminium foil'] },
  { id: 'copper', kind: 'electrode-material', name: 'copper', abbreviations: ['Cu'], synonyms: ['copper foil'] },
  { id: 'nickel', kind: 'electrode-material', name: 'nickel', abbreviations: ['Ni'], synonyms: [] },
  { id: 'titanium', kind: 'electrode-material', name: 'titanium', abbreviations: ['Ti'], synonyms: [] },
  { id: 'graphite', kind: 'electrode-material', name: 'graphite', abbreviations: [], synonyms: ['graphite foil', 'HOPG'] },
  { id: 'bdd', kind: 'electrode-material', name: 'boron-doped diamond', abbreviations: ['BDD'], synonyms: ['boron doped diamond'] },
  { id: 'carbon-black', kind: 'electrode-material', name: 'carbon black', abbreviations: ['CB'], synonyms: ['acetylene black', 'Super P'] },
  { id: 'lithium-metal', kind: 'electrode-material', name: 'lithium metal', abbreviations: [], synonyms: ['lithium foil', 'Li metal'] },
  { id: 'sodium-metal', kind: 'electrode-material', name: 'sodium metal', abbreviations: [], synonyms: ['Na metal'] },
  { id: 'zinc-metal', kind: 'electrode-material', name: 'zinc metal', abbreviations: [], synonyms: ['zinc foil', 'Zn metal'] },
];

const separators: VocabularyTermInput[] = [
  { id: 'glass-fibre', kind: 'separator', name: 'glass fibre separator', abbreviations: ['GF'], synonyms: ['glass fiber separator', 'glass microfibre'] },
  { id: 'polypropylene-separator', kind: 'separator', name: 'microporous polypropylene separator', abbreviations: ['PP'], synonyms: ['polypropylene membrane'] },
  { id: 'cellulose-separator', kind: 'separator', name: 'cellulose separator', abbreviations: [], synonyms: ['paper separator'] },
];

const BF = 'Bard & Faulkner, Electrochemical Methods';
const CRC = 'CRC Handbook of Chemistry and Physics, electrochemical series';

const references: VocabularyTermInput[] = [
  { id: 'ref-she', kind: 'reference-electrode', name: 'standard hydrogen electrode', abbreviations: ['SHE', 'NHE'], synonyms: ['normal hydrogen electrode'], scale: 'SHE', potentialVsSheV: 0, potentialSource: 'definition of the scale' },
  { id: 'ref-ag-agcl-sat', kind: 'reference-electrode', name: 'Ag/AgCl, sat. KCl', abbreviations: ['Ag/AgCl'], synonyms: ['Ag/AgCl (saturated KCl)', 'silver/silver chloride, saturated KCl'], scale: 'Ag/AgCl-sat', potentialVsSheV: 0.197, potentialSource: BF },
  { id: 'ref-ag-agcl-3.5m', kind: 'reference-electrode', name: 'Ag/AgCl, 3.5 M KCl', abbreviations: [], synonyms: ['Ag/AgCl (3.5 M KCl)'], scale: 'Ag/AgCl-3.5M', potentialVsSheV: 0.205, potentialSource: 'Sawyer, Sobkowiak, Roberts, Electrochemistry for Chemists (1995)' },
  { id: 'ref-ag-agcl-3m', kind: 'reference-electrode', name: 'Ag/AgCl, 3 M KCl', abbreviations: [], synonyms: ['Ag/AgCl (3 M KCl)'], scale: 'Ag/AgCl-3M', potentialVsSheV: 0.21, potentialSource: 'common table value (common practice)' },
  { id: 'ref-ag-agcl-1m', kind: 'reference-electrode', name: 'Ag/AgCl, 1 M KCl', abbreviations: [], synonyms: ['Ag/AgCl (1 M KCl)'], scale: 'Ag/AgCl-1M', potentialVsSheV: 0.236, potentialSource: 'tables after Ives & Janz' },
  { id: 'ref-sce', kind: 'reference-electrode', name: 'saturated calomel electrode', abbreviations: ['SCE'], synonyms: ['Hg/Hg2Cl2, sat. KCl', 'calomel (saturated KCl)'], scale: 'SCE', potentialVsSheV: 0.2412, potentialSource: BF },
  { id: 'ref-nce', kind: 'reference-electrode', name: 'normal calomel electrode', abbreviations: ['NCE'], synonyms: ['Hg/Hg2Cl2, 1 M KCl'], scale: 'NCE', potentialVsSheV: 0.2801, potentialSource: 'published tables' },
  { id: 'ref-hg-hgo-0.1m-naoh', kind: 'reference-electrode', name: 'Hg/HgO, 0.1 M NaOH', abbreviations: [], synonyms: ['mercury/mercury oxide, 0.1 M NaOH'], scale: 'Hg/HgO-0.1M-NaOH', potentialVsSheV: 0.165, potentialSource: 'published tables' },
  { id: 'ref-hg-hgo-1m-koh', kind: 'reference-electrode', name: 'Hg/HgO, 1 M KOH', abbreviations: ['Hg/HgO'], synonyms: ['mercury/mercury oxide, 1 M KOH'], scale: 'Hg/HgO-1M-KOH', potentialVsSheV: 0.098, potentialSource: 'usual figure (common practice); published values spread by tens of mV' },
  { id: 'ref-hg-hg2so4-sat', kind: 'reference-electrode', name: 'Hg/Hg2SO4, sat. K2SO4', abbreviations: ['MSE'], synonyms: ['mercury/mercurous sulfate', 'Hg/Hg₂SO₄'], scale: 'Hg/Hg2SO4-sat', potentialVsSheV: 0.64, potentialSource: BF },
  { id: 'ref-li', kind: 'reference-electrode', name: 'Li+/Li', abbreviations: [], synonyms: ['Li/Li+', 'lithium reference'], scale: 'Li+/Li', potentialVsSheV: -3.04, potentialSource: CRC },
  { id: 'ref-na', kind: 'reference-electrode', name: 'Na+/Na', abbreviations: [], synonyms: ['Na/Na+', 'sodium reference'], scale: 'Na+/Na', potentialVsSheV: -2.71, potentialSource: CRC },
  { id: 'ref-k', kind: 'reference-electrode', name: 'K+/K', abbreviations: [], synonyms: ['K/K+', 'potassium reference'], scale: 'K+/K', potentialVsSheV: -2.931, potentialSource: CRC },
  { id: 'ref-mg', kind: 'reference-electrode', name: 'Mg2+/Mg', abbreviations: [], synonyms: ['Mg/Mg2+', 'magnesium reference'], scale: 'Mg2+/Mg', potentialVsSheV: -2.372, potentialSource: CRC },
  { id: 'ref-zn', kind: 'reference-electrode', name: 'Zn2+/Zn', abbreviations: [], synonyms: ['Zn/Zn2+', 'zinc reference'], scale: 'Zn2+/Zn', potentialVsSheV: -0.7618, potentialSource: CRC },
  // Scales without a fixed potential: RHE moves with pH; ferrocene depends on the electrolyte.
  { id: 'ref-rhe', kind: 'reference-electrode', name: 'reversible hydrogen electrode', abbreviations: ['RHE'], synonyms: [], scale: 'RHE' },
  { id: 'ref-fc', kind: 'reference-electrode', name: 'Fc+/Fc', abbreviations: [], synonyms: ['ferrocene', 'ferrocenium/ferrocene', 'Fc/Fc+'], scale: 'Fc+/Fc' },
];

export const VOCABULARY: readonly VocabularyTermInput[] = [...solvents, ...salts, ...additives, ...electrodes, ...separators, ...references];
