// Barrier height at the metal/oxide interface: Schottky–Mott, pinned by interface (induced gap) states, or given.
import { EPS0_F_PER_M, Q_ELEMENTARY_C } from '../constants.js';
import { InputError } from '../errors.js';
import type { BarrierModel } from '../types.js';

export interface BarrierInput {
  model: BarrierModel;
  metalWorkFunction_eV: number;
  electronAffinity_eV: number;
  bandGap_eV: number;
  /** high-frequency permittivity, for the empirical pinning factor */
  opticalPermittivity: number;
  /** carrier the barrier is quoted for: electrons (n-type support) or holes (p-type) */
  carrier: 'electron' | 'hole';
  pinningFactor?: number | undefined;
  /** charge-neutrality level below the vacuum level, eV */
  neutralLevel_eV?: number | undefined;
  /** measured barrier for the carrier type, eV (model 'given') */
  givenBarrier_eV?: number | undefined;
}

export interface BarrierResult {
  /** E_C(0) - E_F at the interface, eV: what the electrostatics needs */
  electronBarrier_eV: number;
  /** barrier for the quoted carrier, eV */
  barrierHeight_eV: number;
  pinningFactor: number | null;
  /** where the pinning factor came from */
  pinningFactorOrigin: 'given' | 'empirical' | null;
}

// Empirical pinning factor S = 1 / (1 + 0.1 (eps_inf - 1)^2) (Mönch's fit to barrier-height slopes;
// W. Mönch, Semiconductor Surfaces and Interfaces, Springer; from memory, verify).
export function empiricalPinningFactor(opticalPermittivity: number): number {
  return 1 / (1 + 0.1 * (opticalPermittivity - 1) ** 2);
}

export function barrierHeight(input: BarrierInput): BarrierResult {
  const { metalWorkFunction_eV: phiM, electronAffinity_eV: chi, bandGap_eV: gap } = input;
  let electronBarrier: number;
  let pinningFactor: number | null = null;
  let pinningFactorOrigin: BarrierResult['pinningFactorOrigin'] = null;
  switch (input.model) {
    case 'ideal':
      // Schottky–Mott rule: Phi_Bn = Phi_m - chi (vacuum levels aligned, no interface dipole)
      electronBarrier = phiM - chi;
      break;
    case 'pinned': {
      if (input.neutralLevel_eV === undefined) {
        throw new InputError('--neutral-level', 'the pinned barrier model needs a charge-neutrality level', 'an energy below vacuum, e.g. "4.5 eV"');
      }
      if (input.pinningFactor !== undefined) {
        pinningFactor = input.pinningFactor;
        pinningFactorOrigin = 'given';
      } else {
        pinningFactor = empiricalPinningFactor(input.opticalPermittivity);
        pinningFactorOrigin = 'empirical';
      }
      // MIGS/CNL model: Phi_Bn = S (Phi_m - Phi_CNL) + (Phi_CNL - chi) (Cowley–Sze form with the CNL as reference)
      electronBarrier = pinningFactor * (phiM - input.neutralLevel_eV) + (input.neutralLevel_eV - chi);
      break;
    }
    case 'interface-states':
      // the barrier depends on the space charge: solved with it in src/interface/interfaceStates.ts
      throw new RangeError('barrierHeight: the interface-states model is solved by solveInterfaceAlignment, not here');
    case 'given': {
      if (input.givenBarrier_eV === undefined) {
        throw new InputError('--barrier', 'the given barrier model needs --barrier', 'an energy, e.g. "0.8 eV"');
      }
      // a measured barrier for holes is E_F - E_V(0) = Eg - (E_C(0) - E_F)
      electronBarrier = input.carrier === 'electron' ? input.givenBarrier_eV : gap - input.givenBarrier_eV;
      break;
    }
  }
  const barrierHeight_eV = input.carrier === 'electron' ? electronBarrier : gap - electronBarrier;
  return { electronBarrier_eV: electronBarrier, barrierHeight_eV, pinningFactor, pinningFactorOrigin };
}

// Image-force (Schottky) lowering dPhi = sqrt(q E_max / (4 pi eps_img eps0)) (Sze & Ng ch. 3), in eV for E in V/m.
export function imageForceLowering_eV(interfaceField_V_per_m: number, imagePermittivity: number): number {
  const field = Math.abs(interfaceField_V_per_m);
  return Math.sqrt((Q_ELEMENTARY_C * field) / (4 * Math.PI * imagePermittivity * EPS0_F_PER_M));
}
