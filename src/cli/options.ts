// Shared CLI option definitions: flags -> ContactOptions fields. Names are the contract in issue 2.
import { Command, Option } from 'commander';
import type { ContactOptions } from '../inputs/contactInput.js';

interface FlagSpec {
  flags: string;
  description: string;
  key: keyof ContactOptions;
  choices?: string[];
}

/** Material and contact flags shared by `contact`, `screen` and `demo`-like commands. */
export const CONTACT_FLAGS: FlagSpec[] = [
  { flags: '--work-function <E>', description: 'metal work function (eV if bare)', key: 'workFunction' },
  { flags: '--work-function-shift <E>', description: 'shift added to the work function (adsorbates, size effects)', key: 'workFunctionShift' },
  { flags: '--work-function-shift-source <TEXT>', description: 'where the shift comes from (recorded in provenance)', key: 'workFunctionShiftSource' },
  { flags: '--support-formula <FORMULA>', description: 'estimate the electron affinity of an unlisted oxide, e.g. Ce0.8Zr0.2O2', key: 'supportFormula' },
  { flags: '--electron-affinity <E>', description: 'support electron affinity (eV)', key: 'electronAffinity' },
  { flags: '--band-gap <E>', description: 'support band gap (eV)', key: 'bandGap' },
  { flags: '--permittivity <ER>', description: 'static relative permittivity', key: 'permittivity' },
  { flags: '--optical-permittivity <ER>', description: 'high-frequency permittivity (image force, pinning factor)', key: 'opticalPermittivity' },
  { flags: '--electron-mass <M>', description: 'electron density-of-states mass (m_e)', key: 'electronMass' },
  { flags: '--hole-mass <M>', description: 'hole density-of-states mass (m_e)', key: 'holeMass' },
  { flags: '--donors <N>', description: 'donor defect density (cm^-3 if bare)', key: 'donors' },
  { flags: '--donor-level <E>', description: 'donor (0/+) level depth below E_C; omit = fully ionised', key: 'donorLevel' },
  { flags: '--donor-level2 <E>', description: 'double donor (+/2+) level depth below E_C', key: 'donorLevel2' },
  { flags: '--donor-type <KIND>', description: 'single or double donor', key: 'donorType', choices: ['single', 'double'] },
  { flags: '--acceptors <N>', description: 'acceptor density (cm^-3 if bare)', key: 'acceptors' },
  { flags: '--acceptor-level <E>', description: 'acceptor level height above E_V; omit = fully ionised', key: 'acceptorLevel' },
  { flags: '--temperature <T>', description: 'temperature (K if bare; "200 degC" works)', key: 'temperature' },
  { flags: '--barrier-model <MODEL>', description: 'barrier model', key: 'barrierModel', choices: ['ideal', 'pinned', 'given'] },
  { flags: '--pinning-factor <S>', description: 'pinning factor S (default: empirical from the optical permittivity)', key: 'pinningFactor' },
  { flags: '--neutral-level <E>', description: 'charge-neutrality level below vacuum (eV)', key: 'neutralLevel' },
  { flags: '--barrier <E>', description: 'measured barrier for the majority carrier (model "given")', key: 'barrier' },
  { flags: '--geometry <KIND>', description: 'planar contact, isolated hemisphere, or particle array', key: 'geometry', choices: ['planar', 'hemisphere', 'array'] },
  { flags: '--particle-diameter <D>', description: 'particle diameter (nm if bare; default 2 nm)', key: 'particleDiameter' },
  { flags: '--particle-density <N>', description: 'particles per area (cm^-2 if bare), for --geometry array', key: 'particleDensity' },
  { flags: '--support-thickness <L>', description: 'support grain thickness (nm if bare); default semi-infinite', key: 'supportThickness' },
  { flags: '--statistics <KIND>', description: 'carrier statistics', key: 'statistics', choices: ['fermi-dirac', 'boltzmann'] },
  { flags: '--reduction-temperature <T>', description: 'reduction pretreatment temperature (vacancies frozen in)', key: 'reductionTemperature' },
  { flags: '--oxygen-pressure <P>', description: 'oxygen pressure of the pretreatment (bar if bare, "1e-20 bar")', key: 'oxygenPressure' },
  { flags: '--hydrogen-to-water <R>', description: 'pH2/pH2O of the reducing gas', key: 'hydrogenToWater' },
  { flags: '--reduction-enthalpy <E>', description: 'vacancy formation (reduction) enthalpy per vacancy, eV', key: 'reductionEnthalpy' },
  { flags: '--reduction-entropy <S>', description: 'reduction entropy per vacancy, in k_B', key: 'reductionEntropy' },
  { flags: '--oxygen-sites <N>', description: 'oxygen lattice site density (cm^-3 if bare)', key: 'oxygenSites' },
  { flags: '--uncertainty <N>', description: 'Monte Carlo samples over published input ranges', key: 'uncertainty' },
  { flags: '--seed <S>', description: 'seed for --uncertainty (default 1)', key: 'seed' },
  { flags: '--refinement <F>', description: 'mesh refinement factor (default 1)', key: 'refinement' },
];

export function addContactFlags(command: Command, skip: (keyof ContactOptions)[] = []): Command {
  for (const spec of CONTACT_FLAGS) {
    if (skip.includes(spec.key)) continue;
    const option = new Option(spec.flags, spec.description);
    if (spec.choices) option.choices(spec.choices);
    command.addOption(option);
  }
  command.option('--materials <FILE...>', 'extra materials file(s) (JSON/YAML) adding or overriding entries');
  return command;
}

/** commander's parsed options -> ContactOptions (only the keys that were given). */
export function contactOptionsFrom(parsed: Record<string, unknown>): ContactOptions {
  const out: Record<string, unknown> = {};
  for (const spec of CONTACT_FLAGS) {
    const value = parsed[spec.key];
    if (value !== undefined) out[spec.key] = spec.key === 'refinement' ? Number(value) : value;
  }
  if (typeof parsed['metal'] === 'string') out['metal'] = parsed['metal'];
  if (typeof parsed['support'] === 'string') out['support'] = parsed['support'];
  if (Array.isArray(parsed['materials'])) out['materials'] = parsed['materials'];
  return out as ContactOptions;
}
