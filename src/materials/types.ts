// Shapes of materials records as the rest of the pipeline consumes them.
// The materials library (materials/*.json, validated by zod in schema.ts) produces these.

/** One numeric property with its provenance. */
export interface PropertyValue {
  value: number;
  /** spread across facets, preparations or sources; when absent the value is taken as exact for sampling */
  min?: number;
  max?: number;
  /** key into the references (CSL-JSON `id`) */
  source: string;
  /** e.g. "polycrystalline", "(111) face", "from memory of <source>, verify" */
  note?: string;
  /** true when the value was not checked against a found copy of the source */
  fromMemory?: boolean;
}

export interface MetalRecord {
  kind: 'metal';
  /** canonical key, the element symbol, e.g. "Pt" */
  name: string;
  fullName: string;
  workFunction_eV: PropertyValue;
  density_g_cm3: PropertyValue;
  molarMass_g_mol: PropertyValue;
  metallicRadius_pm: PropertyValue;
  /** electronic density of states at the Fermi level, states per eV per atom (both spins) */
  densityOfStatesAtFermi_per_eV_atom?: PropertyValue;
  /** alpha in W(R) = W + alpha e^2/(4 pi eps0 R) for a sphere of radius R (3/8: Wood 1981; 1/2: classical sphere) */
  sizeWorkFunctionCoefficient?: PropertyValue;
}

export type ConductionType = 'n' | 'p' | 'insulator';

export interface DefectLevel {
  /** 'single' donor (degeneracy 2), 'double' donor (two levels, e.g. oxygen vacancy) */
  type: 'single' | 'double';
  /** depth of the (0/+) level below E_C, eV */
  level1_eV: PropertyValue;
  /** depth of the (+/2+) level below E_C for a double donor, eV */
  level2_eV?: PropertyValue;
  /** description, e.g. "oxygen vacancy" */
  label: string;
}

export interface AcceptorLevel {
  /** height above E_V, eV */
  level_eV: PropertyValue;
  label: string;
}

/** Chemical (or tracer) diffusion coefficient D = prefactor exp(-activation / k_B T), for re-equilibration times. */
export interface VacancyDiffusion {
  prefactor_cm2_s: PropertyValue;
  activation_eV: PropertyValue;
  /** what was measured (chemical, tracer or vacancy diffusion; temperature range) */
  label?: string;
}

/** Reduction thermodynamics for O_O = V_O(2+) + 2e- + 1/2 O2(g) (per vacancy formed). */
export interface ReductionThermo {
  enthalpy_eV: PropertyValue;
  /** entropy in units of k_B */
  entropy_kB: PropertyValue;
  /** density of oxygen lattice sites, per cm^3 */
  oxygenSites_cm3: PropertyValue;
  /** the defect law the enthalpy and entropy belong to, and the data it represents (text) */
  law?: string;
  vacancyDiffusion?: VacancyDiffusion;
}

export interface SupportRecord {
  kind: 'support';
  /** canonical key, e.g. "ZnO", "TiO2-anatase" */
  name: string;
  fullName: string;
  formula: string;
  electronAffinity_eV: PropertyValue;
  bandGap_eV: PropertyValue;
  staticPermittivity: PropertyValue;
  opticalPermittivity: PropertyValue;
  electronMass_me: PropertyValue;
  holeMass_me: PropertyValue;
  conductionType: ConductionType;
  donor?: DefectLevel;
  acceptor?: AcceptorLevel;
  /** typical native donor (n-type) or acceptor (p-type) density range, per cm^3 */
  typicalDensity_cm3?: PropertyValue;
  /** charge-neutrality level as an energy below the vacuum level (same scale as a work function), eV */
  neutralLevel_eV?: PropertyValue;
  pinningFactor?: PropertyValue;
  /** charge-neutrality level (branch point of the metal-induced gap states) above the valence-band maximum, eV */
  chargeNeutralityAboveValence_eV?: PropertyValue;
  /** thickness of an interfacial layer between metal and oxide, nm */
  interfaceLayerThickness_nm?: PropertyValue;
  /** relative permittivity of that interfacial layer */
  interfaceLayerPermittivity?: PropertyValue;
  /**
   * quartic Landau coefficient beta of a paraelectric support, E = alpha P + beta P^3, V m^5 C^-3: the static
   * permittivity falls with field (SrTiO3); absent = a linear dielectric
   */
  permittivityNonlinearity_V_m5_per_C3?: PropertyValue;
  /**
   * Curie–Weiss temperature T0 of a paraelectric support, K: the static permittivity (taken as measured at
   * CURIE_WEISS_REFERENCE_K = 300 K) follows eps(T) = eps(300 K) (300 K - T0) / (T - T0) at other temperatures
   */
  curieWeissTemperature_K?: PropertyValue;
  /** density of sites that can hold a localised (small-polaron, reduced-cation) electron, per cm^3 */
  localisedSiteDensity_cm3?: PropertyValue;
  /** depth of the localised (small-polaron) level below the conduction-band edge E_C, eV (positive) */
  localisedLevel_eV?: PropertyValue;
  /** Mott critical donor density above which donors no longer bind electrons, per cm^3 */
  mottCriticalDensity_cm3?: PropertyValue;
  reduction?: ReductionThermo;
}

/** A CSL-JSON item (subset) https://citeproc-js.readthedocs.io/en/latest/csl-json/markup.html */
export interface CslItem {
  id: string;
  type: string;
  title: string;
  author?: { family?: string; given?: string; literal?: string }[];
  'container-title'?: string;
  volume?: string;
  page?: string;
  issued?: { 'date-parts': (number | string)[][] };
  DOI?: string;
  URL?: string;
  edition?: string;
  publisher?: string;
  note?: string;
}

export interface MaterialsLibrary {
  metals: Map<string, MetalRecord>;
  supports: Map<string, SupportRecord>;
  references: Map<string, CslItem>;
}

/** Provenance of one input used by a computation, for properties tables. */
export interface InputProvenance {
  field: string;
  value: number;
  unit: string;
  min?: number;
  max?: number;
  /** 'library' = materials entry, 'user' = given on the command line / API, 'estimate' = computed, 'default' */
  origin: 'library' | 'user' | 'estimate' | 'default' | 'derived';
  source?: string;
  citation?: string;
  note?: string;
  fromMemory?: boolean;
}
