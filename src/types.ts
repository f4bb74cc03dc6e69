// The result contract of `bandbend contact --json` and `solveContact()`.
// Later tools rely on these names: add fields freely, never rename.
import type { InputProvenance } from './materials/types.js';

export type FlowDirection = 'support-to-metal' | 'metal-to-support' | 'none';
export type GeometryKind = 'planar' | 'hemisphere' | 'array' | 'disc' | 'disc-array';
export type Statistics = 'fermi-dirac' | 'boltzmann';
export type BarrierModel = 'interface-states' | 'ideal' | 'pinned' | 'given';

export interface Warning {
  code: string;
  message: string;
}

export interface Profile {
  /** distance from the interface into the support, nm */
  x_nm: number[];
  /** E_C - E_F, eV */
  conductionBand_eV: number[];
  /** E_V - E_F, eV */
  valenceBand_eV: number[];
  electronDensity_cm3: number[];
  holeDensity_cm3: number[];
  chargeDensity_C_per_m3: number[];
  /** electric field, V/m, positive pointing into the support (away from the metal) */
  field_V_per_m: number[];
}

export interface SolverInfo {
  /** always true: a solve that does not converge throws ConvergenceError instead of returning */
  converged: true;
  iterations: number;
  meshPoints: number;
  domainLength_nm: number;
  /**
   * Richardson correction relative to the charge, |Q_fine - Q_coarse| / 3 / |Q|: an upper estimate of the
   * error of the unextrapolated charge (the reported, extrapolated charge is typically 100x better)
   */
  chargeErrorEstimate: number;
  /** stated bound on the relative error of the reported charge (= chargeErrorEstimate) */
  chargeErrorBound: number;
  /** chargeErrorBound met the solver's tolerance; false raises `mesh-accuracy` */
  meetsTolerance: boolean;
}

export interface ParticleInfo {
  diameter_nm: number;
  atoms: number | null;
  surfaceAtoms: number | null;
  dispersion: number | null;
  electronsPerSurfaceAtom: number | null;
  chargingEnergy_eV: number;
  chargingEnergyOverKT: number;
  /** areal particle density per cm^2 when an array was modelled */
  particleDensity_cm2: number | null;
  meanSpacing_nm: number | null;
  zonesOverlap: boolean | null;
}

export interface ExchangeInfo {
  richardsonConstant_A_per_cm2_K2: number;
  exchangeCurrentDensity_A_per_cm2: number;
  /** log10 of the exchange current density, A/cm^2 (finite even when the current underflows) */
  exchangeCurrentLog10_A_per_cm2: number;
  /** time to build the equilibrium charge by thermionic exchange, s (null when it exceeds a double) */
  equilibrationTime_s: number | null;
  equilibrationTimeLog10_s: number;
  /** equilibrium (99% of the charge) is reached within an hour neither at the reaction temperature nor at the
   * highest temperature of the history (before issue 10: |Q|/J0 above an hour) */
  slow: boolean;
  /** log10 exchange current through the computed barrier (thermionic + tunnelling), A/cm^2 */
  profileExchangeCurrentLog10_A_per_cm2: number | null;
  /** profile exchange current / thermionic current (>= 1) */
  tunnellingEnhancement: number | null;
  /** time to reach 99% of the equilibrium charge from flat bands at the reaction temperature, s */
  relaxationTime99_s: number | null;
  relaxationTime99Log10_s: number | null;
  /** highest temperature of the history (reduction pretreatment) when above the reaction temperature, K */
  historyTemperature_K: number | null;
  historyRelaxationTime99_s: number | null;
  historyRelaxationTime99Log10_s: number | null;
}

export interface PretreatmentInfo {
  mode: 'given' | 'equilibrium' | 'frozen-in';
  reductionTemperature_K: number | null;
  oxygenPressure_Pa: number | null;
  hydrogenToWater: number | null;
  vacancyDensity_cm3: number | null;
  /** temperature at which vacancies equilibrated with the gas, K */
  equilibrationTemperature_K: number | null;
}

/** Oxygen vacancies of the support in the reaction atmosphere at the reaction temperature. */
export interface DefectsInfo {
  /** 'none' without a reaction gas (the donors are given, from the library, or from a reduction alone) */
  history: 'none' | 'frozen' | 'equilibrated' | 'kinetic' | 'overlayer-as-deposited' | 'overlayer-annealed';
  /** 'O2', 'H2/H2O' or 'CO/CO2'; null without a reaction gas */
  reactionGas: string | null;
  /** the given pO2 or the pH2/pH2O or pCO/pCO2 ratio */
  reactionGasValue: number | null;
  /** equilibrium pO2 of the reaction gas at the reaction temperature, bar (NIST-JANAF gas equilibria) */
  oxygenPartialPressure_bar: number | null;
  log10OxygenPartialPressure_bar: number | null;
  /** vacancies during the reaction (the double-donor density used), cm^-3 */
  vacancies_cm3: number | null;
  /** vacancies in equilibrium with the reaction gas at the reaction temperature, cm^-3 */
  equilibriumVacancies_cm3: number | null;
  /** grain^2 / D at the reaction temperature, s; null where no diffusion coefficient is published or given */
  reequilibrationTime_s: number | null;
  /** mean approach to the reaction-gas equilibrium over the time on stream; null without D or time */
  equilibratedFraction: number | null;
  timeOnStream_s: number | null;
  grainSize_nm: number | null;
  /** inverse catalyst: the overlayer's thickness, nm, and its anneal temperature, K (the anneal gas is the O2 above) */
  overlayerThickness_nm: number | null;
  annealTemperature_K: number | null;
  notes: string[];
}

export interface UncertaintySummary {
  samples: number;
  seed: number;
  failed: number;
  /** inputs that were varied within their published ranges */
  sampledInputs: string[];
  directionProbability: Record<FlowDirection, number>;
  barrierHeight_eV: Percentiles;
  bandBending_eV: Percentiles;
  electronsPerParticle: Percentiles;
}

export interface Percentiles {
  p05: number;
  p50: number;
  p95: number;
}

export interface ContactResult {
  metal: string;
  support: string;
  temperature_K: number;
  geometry: GeometryKind;
  statistics: Statistics;
  barrierModel: BarrierModel;
  /** which carrier the barrier is quoted for: electrons for n-type supports, holes for p-type */
  barrierCarrier: 'electron' | 'hole';
  barrierHeight_eV: number;
  /** electron barrier E_C(0) - E_F regardless of carrier type */
  electronBarrier_eV: number;
  metalWorkFunction_eV: number;
  /** positive = bands bend up toward the interface */
  bandBending_eV: number;
  /** bulk E_C - E_F */
  fermiLevelBelowConduction_eV: number;
  supportWorkFunction_eV: number;
  direction: FlowDirection;
  /** signed charge on the support side per interface area, C/m^2 (positive when the support is positive) */
  spaceCharge_C_per_m2: number;
  chargeEquivalentWidth_nm: number | null;
  /** planar depletion approximation sqrt(2 eps (|V_bb| - kT/q) / (q |Z N_D - N_A|)) */
  depletionWidthApprox_nm: number | null;
  /** true when depletionWidthApprox_nm is the planar formula applied to a curved (hemisphere/array) geometry */
  depletionWidthApproxIsPlanar: boolean;
  /** depletion approximation in a hemispherical shell around the particle (non-planar geometries), nm */
  sphericalDepletionWidth_nm: number | null;
  /** headline width: charge-equivalent width (planar) or depth holding 90% of the charge (hemisphere, array), nm */
  width_nm: number | null;
  widthDefinition: 'charge-equivalent' | 'charge-depth-90';
  /** bulk Debye length; null where it is undefined (nothing screens), with a `debye-undefined` warning */
  debyeLength_nm: number | null;
  interfaceField_V_per_m: number;
  /**
   * differential relative permittivity of the support at the interface field, (1/eps0) dD/dE: the static value for a
   * linear dielectric; lower where a field-dependent (paraelectric) support is polarised to saturation
   */
  interfacePermittivity: number;
  /** quartic Landau coefficient of the support used in the solve, V m^5 C^-3 (0: linear dielectric) */
  permittivityNonlinearity_V_m5_per_C3: number;
  imageForceLowering_eV: number;
  /**
   * the barrier a capacitance-voltage measurement of this contact would report (Mott–Schottky analysis of the model's
   * own C(V), 0-1 V reverse bias; src/derived/capacitanceVoltage.ts): planar contacts on n-type supports in depletion,
   * else null
   */
  capacitanceBarrier: CapacitanceBarrierInfo | null;
  /** distance of the image-force barrier maximum from the metal, nm */
  imageForceMaximum_nm: number;
  /** false when that maximum lies within ~1 nm of the metal (continuum image force doubtful) */
  imageForceContinuumValid: boolean;
  /** electrons gained by the metal particle (negative when it loses them) */
  electronsPerParticle: number;
  donorDensity_cm3: number;
  acceptorDensity_cm3: number;
  /** work function that sets the particle's Fermi level: size-corrected for hemisphere and array geometry (Wood 1981) */
  particleWorkFunction_eV: number;
  /** pinning factor used by the pinned model, or the slope that emerges from the interface states (null otherwise) */
  pinningFactor: number | null;
  /** interface-states model (Bardeen; Cowley & Sze 1965): the self-consistent interface (null for other models) */
  interfaceStates: InterfaceStatesInfo | null;
  /** what photoemission of the support would see: the band bending averaged over the information depth */
  photoemission: PhotoemissionInfo;
  /** depth from the interface holding 90% of the space charge, nm */
  chargeDepth90_nm: number;
  /** a finite support grain depleted through its whole thickness (charge capped by the donors available) */
  supportFullyDepleted: boolean;
  bulk: {
    electronDensity_cm3: number;
    holeDensity_cm3: number;
    ionizedDonors_cm3: number;
    ionizedAcceptors_cm3: number;
    conductionDensityOfStates_cm3: number;
    valenceDensityOfStates_cm3: number;
    /** log10 of the intrinsic density in cm^-3 (may be far below 1e-30, so given as a log) */
    intrinsicDensityLog10_cm3: number;
    /** electrons in localised (small-polaron) states, cm^-3 (0 without them) */
    localisedElectrons_cm3: number;
  };
  particle: ParticleInfo;
  exchange: ExchangeInfo | null;
  pretreatment: PretreatmentInfo;
  /** oxygen vacancies in the reaction atmosphere (issue 12); history 'none' and nulls without a reaction gas */
  defects: DefectsInfo;
  profile: Profile;
  solver: SolverInfo;
  warnings: Warning[];
  cautions: string[];
  /** provenance of every input used */
  inputs: InputProvenance[];
  uncertainty?: UncertaintySummary;
}

export interface CapacitanceBarrierInfo {
  /** the barrier the Mott–Schottky intercept gives, eV (V_bi from the intercept + kT/q + bulk E_C - E_F) */
  barrier_eV: number;
  /** linearity of 1/C^2 against bias (1 = straight) */
  rSquared: number;
  /** reverse bias range of the simulated measurement, V */
  reverseBias_V: [number, number];
}

export interface InterfaceStatesInfo {
  /** density of interface states, per eV per cm^2 */
  stateDensity_per_eV_cm2: number;
  /** charge-neutrality level above E_V, eV */
  neutralLevelAboveValence_eV: number;
  layerThickness_nm: number;
  layerPermittivity: number;
  /** charge of the interface states, C/m^2 (positive = states gave electrons to the metal); includes the surface donors */
  interfaceStateCharge_C_per_m2: number;
  /** donor-like surface states given (--surface-donors), per cm^2, and their depth below E_C, eV (null: none) */
  surfaceDonors_per_cm2: number;
  surfaceDonorLevel_eV: number | null;
  /** the ionised surface donors' part of the interface charge, C/m^2, and the fraction of them ionised */
  surfaceDonorCharge_C_per_m2: number;
  surfaceDonorsIonisedFraction: number | null;
  /** electrons the particle gained from the surface donors under it (part of electronsFromInterfaceStates) */
  electronsFromSurfaceDonors: number;
  /** charge of the metal side, C/m^2: -(space charge + interface states) */
  metalCharge_C_per_m2: number;
  /** potential step across the interfacial layer (vacuum level, metal minus support), eV */
  layerDrop_eV: number;
  /** electrons the particle gained from the interface states and from the space charge */
  electronsFromInterfaceStates: number;
  electronsFromSpaceCharge: number;
  /** Brent evaluations (Poisson solves) of the self-consistent alignment */
  evaluations: number;
}

export interface PhotoemissionInfo {
  /** band bending averaged with weight exp(-x / (lambda cos theta)) over the profile, eV */
  observedBandBending_eV: number;
  /** inelastic mean free path used (Seah & Dench 1979, inorganic compounds), nm */
  inelasticMeanFreePath_nm: number;
  photonEnergy_eV: number;
  coreLevel: string;
  emissionAngle_deg: number;
}
