// Public API of the materials library.
export type {
  PropertyValue,
  MetalRecord,
  SupportRecord,
  ConductionType,
  DefectLevel,
  AcceptorLevel,
  ReductionThermo,
  VacancyDiffusion,
  CslItem,
  MaterialsLibrary,
  InputProvenance,
} from './types.js';
export {
  loadBuiltinLibrary,
  loadLibrary,
  buildLibrary,
  parseMaterialsData,
  readDataFile,
  findMetal,
  findSupport,
  formatCitation,
  provenanceOf,
  SUPPORT_ALIASES,
  METAL_ALIASES,
} from './load.js';
export {
  estimateElectronAffinity,
  parseFormula,
  atomicEnergies,
  mullikenElectronegativity,
  KJ_PER_MOL_PER_EV,
  ESTIMATE_SCATTER_eV,
  ESTIMATE_SOURCE,
  ESTIMATE_CITATION,
  type ElectronAffinityEstimate,
  type ElementTerm,
} from './estimate.js';
export { materialsSchemas, BOUNDS } from './schema.js';
