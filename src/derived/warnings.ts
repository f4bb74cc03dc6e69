// Warnings of one contact as a rule table: code, condition, message. Each rule reads only the SI facts below,
// so it can be tested on its own (test/warnings.test.ts). Adding a warning = one row here.
import type { Warning } from '../types.js';

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
}

export interface WarningRule {
  code: string;
  applies(f: WarningFacts): boolean;
  message(f: WarningFacts): string;
}

const majorityBulk = (f: WarningFacts): number => (f.nType ? f.bulkElectrons_m3 : f.bulkHoles_m3);
/** (E_C - E_F)/kT for n-type, (E_F - E_V)/kT for p-type: below 3 the bulk is degenerate */
const bulkDegeneracy = (f: WarningFacts): number => (f.nType ? -f.bulkReducedFermiLevel : f.bandGap_eV / f.kT_eV + f.bulkReducedFermiLevel);
const nm = (x_m: number, digits: number): string => (x_m * 1e9).toFixed(digits);

/** A finite support grain depleted through its whole thickness (charge capped by the dopants available). */
export function fullyDepleted(f: WarningFacts): boolean {
  if (f.supportThickness_m === undefined || f.endMajority_m3 === null) return false;
  const depletedBand = f.nType ? f.bandBending_eV > 0 : f.bandBending_eV < 0;
  return depletedBand && f.endMajority_m3 < 0.5 * majorityBulk(f);
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
    message: (f) => `thermionic exchange would take ~10^${(f.equilibrationTimeLog10_s ?? 0).toFixed(1)} s (> 1 h) at ${f.temperature_K} K: equilibrium may not be reached`,
  },
  {
    code: 'mesh-accuracy',
    applies: (f) => f.chargeErrorEstimate > f.refineAbove,
    message: (f) => `estimated relative charge error ${f.chargeErrorEstimate.toExponential(1)}; rerun with a finer mesh`,
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
