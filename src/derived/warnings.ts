// Warnings of one contact as a rule table: code, condition, message. Each rule reads only the SI facts below,
// so it can be tested on its own (test/warnings.test.ts). Adding a warning = one row here.
import type { Warning } from '../types.js';
import { EPS0_F_PER_M } from '../constants.js';

/** What the warning rules may look at, all SI (energies in eV). */
export interface WarningFacts {
  temperature_K: number;
  kT_eV: number;
  nType: boolean;
  bandGap_eV: number;
  /** xi = (E_F - E_C)/kT in the bulk */
  bulkReducedFermiLevel: number;
  bandBending_eV: number;
  electronBarrier_eV: number;
  particleDiameter_m: number;
  /** depth holding 90% of the space charge, m */
  depth90_m: number;
  /** carrier densities at the interface and in the bulk, m^-3 */
  interfaceElectrons_m3: number;
  interfaceHoles_m3: number;
  bulkElectrons_m3: number;
  bulkHoles_m3: number;
  /** majority carriers at the far end of a finite support grain, m^-3 (null for a semi-infinite support) */
  endMajority_m3: number | null;
  supportThickness_m: number | undefined;
  layerTruncated: boolean;
  domain_m: number;
  donors_m3: number;
  acceptors_m3: number;
  electronsPerParticle: number;
  chargingEnergy_eV: number;
  chargingEnergyOverKT: number;
  zonesOverlap: boolean | null;
  meanSpacing_m: number | null;
  exchangeSlow: boolean;
  equilibrationTimeLog10_s: number | null;
  chargeErrorEstimate: number;
  /** relative charge error above which the mesh was refined */
  refineAbove: number;
  /** provenance labels of estimated inputs and of library values recalled from memory */
  estimatedInputs: string[];
  unverifiedInputs: string[];
  /** solver's stated relative charge error bound and whether it met the tolerance */
  meetsTolerance: boolean;
  chargeErrorBound: number;
  /** bulk Debye length, m; null when nothing screens */
  debyeLength_m: number | null;
  statistics: 'fermi-dirac' | 'boltzmann';
  /** xi = (E_F - E_C)/kT at the interface */
  interfaceReducedFermiLevel: number;
  /** metal atoms and surface atoms of one particle (null when the metal's data are missing) */
  atoms: number | null;
  surfaceAtoms: number | null;
  interfaceField_V_per_m: number;
  /** interface-states model: space charge per contact area (C/m^2) and the interfacial layer; null for other models */
  interfaceLayer: { spaceCharge_C_per_m2: number; layerThickness_m: number; layerPermittivity: number } | null;
  /** the solve used a field-dependent (Landau–Devonshire) dielectric */
  permittivityFieldDependent: boolean;
  /** static relative permittivity used in the solve */
  staticPermittivity: number;
  /** Devonshire estimate of the permittivity at the interface field (null unless eps > 50) */
  fieldPermittivity: number | null;
  /** distance of the image-force maximum from the metal, m, and whether it is beyond the continuum limit */
  imageForceMaximum_m: number;
  imageForceValid: boolean;
  /** log10 s to 99% of the equilibrium charge at the reaction temperature and at the history's highest one */
  relaxationLog10_s: number | null;
  /** depth of the (first) donor level below E_C, eV; null when the donors are taken as fully ionised */
  donorLevel_eV: number | null;
  historyTemperature_K: number | null;
  historyRelaxationLog10_s: number | null;
}

export interface WarningRule {
  code: string;
  applies(f: WarningFacts): boolean;
  message(f: WarningFacts): string;
}

const majorityBulk = (f: WarningFacts): number => (f.nType ? f.bulkElectrons_m3 : f.bulkHoles_m3);
/** (E_C - E_F)/kT for n-type, (E_F - E_V)/kT for p-type: below 3 the bulk is degenerate */
const bulkDegeneracy = (f: WarningFacts): number => (f.nType ? -f.bulkReducedFermiLevel : f.bandGap_eV / f.kT_eV + f.bulkReducedFermiLevel);
/** (E_C - E_F)/kT (electrons) and (E_F - E_V)/kT (holes) at the interface: below 3 that band is degenerate */
const interfaceDegeneracy = (f: WarningFacts): number => Math.min(-f.interfaceReducedFermiLevel, f.bandGap_eV / f.kT_eV + f.interfaceReducedFermiLevel);

/**
 * Electrons per surface atom above which a result is flagged: photoemission electron counting finds about 0.1 e per
 * Pt atom for Pt on ceria, the strongest known metal–oxide transfer (Lykhach et al., Nat. Mater. 15, 284 (2016);
 * value from memory of that paper, verify); 0.3 is three times that. Above 1 per surface atom the continuum result
 * is unphysical (the surface layer cannot hold more than about one extra electron per atom).
 */
export const PLAUSIBLE_ELECTRONS_PER_SURFACE_ATOM = 0.3;
export const MAX_ELECTRONS_PER_SURFACE_ATOM = 1;
/** Static permittivity and interface field above which a field-independent permittivity is doubtful. */
export const HIGH_PERMITTIVITY = 50;
/**
 * Band gap above which shallow, fully ionised donors are not credible: oxygen-vacancy (F-centre) electrons in MgO
 * absorb near 5 eV, i.e. they are bound several eV deep (Kappers, Kroes & Hensley, Phys. Rev. B 1, 4151 (1970),
 * from memory, verify); the same holds for Al2O3 and SiO2. A donor shallower than 0.1 eV there is flagged.
 */
export const WIDE_GAP_EV = 5;
export const SHALLOW_DONOR_EV = 0.1;
export const HIGH_FIELD_V_PER_M = 1e8;
/**
 * Potential the space charge alone would drop across the interfacial layer, Q_sc delta / (eps_i eps0), above which
 * the interface-state barrier depends mainly on the assumed layer: Cowley & Sze's linear pinning formula neglects
 * that term (small space charge), and delta and eps_i are the least known inputs (common practice, no source).
 */
export const LAYER_SPACE_CHARGE_DROP_V = 0.3;

/** Q_sc delta / (eps_i eps0), V; null outside the interface-states model. */
export function spaceChargeLayerDrop_V(f: WarningFacts): number | null {
  const l = f.interfaceLayer;
  if (l === null || !(l.layerPermittivity > 0)) return null;
  return (Math.abs(l.spaceCharge_C_per_m2) * l.layerThickness_m) / (l.layerPermittivity * EPS0_F_PER_M);
}

const perSurfaceAtom = (f: WarningFacts): number | null => (f.surfaceAtoms ? Math.abs(f.electronsPerParticle) / f.surfaceAtoms : null);
const nm = (x_m: number, digits: number): string => (x_m * 1e9).toFixed(digits);

/** A finite support grain depleted through its whole thickness (charge capped by the dopants available). */
export function fullyDepleted(f: WarningFacts): boolean {
  if (f.supportThickness_m === undefined || f.endMajority_m3 === null) return false;
  const depletedBand = f.nType ? f.bandBending_eV > 0 : f.bandBending_eV < 0;
  // the charge must also fill the grain: a weak Debye tail past a thin depletion layer can lower the far-end
  // majority density below half the bulk value without the layer reaching through (issue 10 item 1: 200 nm grain,
  // 26 nm layer, false warning before)
  return depletedBand && f.endMajority_m3 < 0.5 * majorityBulk(f) && f.depth90_m > 0.5 * f.supportThickness_m;
}

export const WARNING_RULES: readonly WarningRule[] = [
  {
    code: 'continuum-doubtful',
    applies: (f) => f.particleDiameter_m < 1e-9,
    message: (f) => `particle diameter ${nm(f.particleDiameter_m, 2)} nm: below ~1 nm a continuum dielectric model is doubtful`,
  },
  {
    code: 'continuum-doubtful',
    applies: (f) => f.depth90_m > 0 && f.depth90_m < 1e-9,
    message: (f) => `90% of the space charge lies within ${nm(f.depth90_m, 2)} nm of the interface: continuum electrostatics is doubtful below ~1 nm`,
  },
  {
    code: 'degenerate-bulk',
    applies: (f) => bulkDegeneracy(f) < 3,
    message: (f) => `the bulk Fermi level is within ${(bulkDegeneracy(f) * f.kT_eV).toFixed(3)} eV of the ${f.nType ? 'conduction' : 'valence'} band: degenerate support`,
  },
  {
    code: 'thin-accumulation',
    applies: (f) => (f.nType ? f.bandBending_eV < -f.kT_eV : f.bandBending_eV > f.kT_eV) && f.depth90_m < 0.5e-9,
    message: (f) => `accumulation layer about ${nm(f.depth90_m, 2)} nm thick (< 0.5 nm): the charge sits in the first atomic layers`,
  },
  {
    // minority carriers outnumber majority carriers at the interface
    code: 'inversion',
    applies: (f) => {
      const [minority, majority] = f.nType ? [f.interfaceHoles_m3, f.interfaceElectrons_m3] : [f.interfaceElectrons_m3, f.interfaceHoles_m3];
      return minority > majority && minority > majorityBulk(f) * 1e-3;
    },
    message: () => 'minority carriers dominate at the interface (inversion layer)',
  },
  {
    code: 'fermi-level-outside-gap',
    applies: (f) => f.electronBarrier_eV < 0 || f.electronBarrier_eV > f.bandGap_eV,
    message: (f) => `the interface Fermi level lies ${f.electronBarrier_eV < 0 ? 'above the conduction band' : 'below the valence band'}: ohmic-like contact`,
  },
  {
    code: 'fully-depleted',
    applies: fullyDepleted,
    message: (f) => `the support (${nm(f.supportThickness_m ?? 0, 1)} nm) is depleted through its whole thickness: the transferred charge is capped by the donors available`,
  },
  {
    code: 'layer-truncated',
    applies: (f) => f.supportThickness_m === undefined && f.layerTruncated,
    message: (f) => `the space-charge layer did not decay within ${nm(f.domain_m, 0)} nm; results are for that depth`,
  },
  {
    code: 'undoped-support',
    applies: (f) => f.donors_m3 === 0 && f.acceptors_m3 === 0,
    message: () => 'no donor or acceptor density was given or found in the library: the support is treated as undoped (give --donors, --acceptors or reduction conditions)',
  },
  {
    code: 'insulating-support',
    applies: (f) => majorityBulk(f) < 1e12,
    message: (f) => `bulk carrier density ${(majorityBulk(f) * 1e-6).toExponential(1)} cm^-3: an insulating support exchanges almost no charge`,
  },
  {
    code: 'sub-electron-transfer',
    applies: (f) => Math.abs(f.electronsPerParticle) < 1 && f.bandBending_eV !== 0,
    message: (f) => `mean transfer ${f.electronsPerParticle.toPrecision(2)} electrons per particle (< 1): individual particles are either charged by one electron or not at all`,
  },
  {
    code: 'charge-quantised',
    applies: (f) => f.chargingEnergyOverKT > 1,
    message: (f) => `single-electron charging energy ${f.chargingEnergy_eV.toFixed(3)} eV exceeds kT (${f.kT_eV.toFixed(4)} eV): charging is quantised`,
  },
  {
    code: 'zones-overlap',
    applies: (f) => f.zonesOverlap === true,
    message: (f) => `space-charge zones of neighbouring particles overlap (layer ${nm(f.depth90_m, 1)} nm > half the spacing ${nm((f.meanSpacing_m ?? 0) / 2, 1)} nm)`,
  },
  {
    code: 'slow-exchange',
    applies: (f) => f.exchangeSlow,
    message: (f) =>
      `reaching 99% of the equilibrium charge would take ~10^${(f.relaxationLog10_s ?? f.equilibrationTimeLog10_s ?? 0).toFixed(1)} s (> 1 h) at ${f.temperature_K} K` +
      (f.historyTemperature_K !== null ? ` and ~10^${(f.historyRelaxationLog10_s ?? 0).toFixed(1)} s at ${f.historyTemperature_K} K (pretreatment)` : '') +
      ': equilibrium may not be reached',
  },
  {
    code: 'mesh-accuracy',
    applies: (f) => !f.meetsTolerance,
    message: (f) => `the mesh did not meet the charge tolerance: stated bound on the relative charge error ${f.chargeErrorBound.toExponential(1)}; rerun with a finer mesh`,
  },
  {
    code: 'debye-undefined',
    applies: (f) => f.debyeLength_m === null,
    message: () => 'the bulk Debye length is not defined or exceeds 1 m (nothing screens in the bulk): debyeLength_nm is null',
  },
  {
    code: 'implausible-charge',
    applies: (f) => {
      const e = perSurfaceAtom(f);
      return e !== null && e > PLAUSIBLE_ELECTRONS_PER_SURFACE_ATOM && e <= MAX_ELECTRONS_PER_SURFACE_ATOM;
    },
    message: (f) =>
      `${perSurfaceAtom(f)!.toFixed(2)} electrons per surface atom (${(Math.abs(f.electronsPerParticle) / f.atoms!).toFixed(2)} per metal atom) exceeds ${PLAUSIBLE_ELECTRONS_PER_SURFACE_ATOM}: photoemission finds ~0.1 e per Pt atom even on ceria (Lykhach et al., Nat. Mater. 15, 284 (2016))`,
  },
  {
    code: 'unphysical-charge',
    applies: (f) => (perSurfaceAtom(f) ?? 0) > MAX_ELECTRONS_PER_SURFACE_ATOM,
    message: (f) =>
      `${perSurfaceAtom(f)!.toFixed(2)} electrons per surface atom (${(Math.abs(f.electronsPerParticle) / f.atoms!).toFixed(2)} per metal atom): more than one per surface atom is unphysical; the continuum model is outside its range`,
  },
  {
    code: 'space-charge-sets-barrier',
    applies: (f) => (spaceChargeLayerDrop_V(f) ?? 0) > LAYER_SPACE_CHARGE_DROP_V,
    message: (f) =>
      `the space charge (${Math.abs(f.interfaceLayer?.spaceCharge_C_per_m2 ?? 0).toExponential(1)} C/m^2) alone would drop ${(spaceChargeLayerDrop_V(f) ?? 0).toFixed(2)} V across the ${nm(f.interfaceLayer?.layerThickness_m ?? 0, 1)} nm interfacial layer (eps_i ${f.interfaceLayer?.layerPermittivity ?? 1}): the barrier then depends mainly on the assumed layer, not on the interface states (Cowley & Sze's pinning assumes a small space charge); vary --interface-layer-thickness and --interface-layer-permittivity or use --uncertainty`,
  },
  {
    code: 'image-force-continuum',
    applies: (f) => !f.imageForceValid,
    message: (f) => `the image-force barrier maximum lies ${nm(f.imageForceMaximum_m, 2)} nm from the metal (< 1 nm): the continuum image-force lowering is doubtful (Sze & Ng, 3rd ed., ch. 3)`,
  },
  {
    code: 'field-dependent-permittivity',
    // not when the solve already used a field-dependent dielectric (--permittivity-nonlinearity / library beta)
    applies: (f) => !f.permittivityFieldDependent && f.staticPermittivity > HIGH_PERMITTIVITY && Math.abs(f.interfaceField_V_per_m) > HIGH_FIELD_V_PER_M,
    message: (f) =>
      `static permittivity ${f.staticPermittivity.toFixed(0)} used at an interface field of ${Math.abs(f.interfaceField_V_per_m).toExponential(1)} V/m; in SrTiO3-like supports it falls with field` +
      (f.fieldPermittivity !== null ? ` (Devonshire estimate ~${f.fieldPermittivity.toFixed(0)}, Phil. Mag. 40, 1040 (1949))` : '') +
      ': band bending and charge near the interface are overstated (give --permittivity-nonlinearity to solve with it)',
  },
  {
    code: 'shallow-donors-in-insulator',
    applies: (f) => f.bandGap_eV > WIDE_GAP_EV && f.donors_m3 > 0 && (f.donorLevel_eV === null || f.donorLevel_eV < SHALLOW_DONOR_EV),
    message: (f) =>
      `${f.donorLevel_eV === null ? 'fully ionised' : `${f.donorLevel_eV.toFixed(2)} eV deep`} donors (${(f.donors_m3 * 1e-6).toExponential(1)} cm^-3) in a ${f.bandGap_eV.toFixed(1)} eV-gap insulator: donors there are eV deep (F centres in MgO absorb near 5 eV, Kappers et al., Phys. Rev. B 1, 4151 (1970)); band bending and charge are overstated`,
  },
  {
    code: 'boltzmann-invalid',
    applies: (f) => f.statistics === 'boltzmann' && (bulkDegeneracy(f) < 3 || interfaceDegeneracy(f) < 3),
    message: () => 'Boltzmann statistics where a band is degenerate (Fermi level within 3 kT of a band edge, in the bulk or at the interface): carrier densities are overstated; use Fermi-Dirac statistics',
  },
  {
    code: 'estimated-input',
    applies: (f) => f.estimatedInputs.length > 0,
    message: (f) => `estimated inputs: ${f.estimatedInputs.join(', ')}`,
  },
  {
    code: 'unverified-input',
    applies: (f) => f.unverifiedInputs.length > 0,
    message: (f) => `library values not verified against a found source: ${f.unverifiedInputs.join(', ')}`,
  },
];

/** The warnings that apply, in table order. */
export function evaluateWarnings(facts: WarningFacts, rules: readonly WarningRule[] = WARNING_RULES): Warning[] {
  return rules.filter((r) => r.applies(facts)).map((r) => ({ code: r.code, message: r.message(facts) }));
}
