// Thermionic electron exchange across the metal/support barrier and the time it takes to build the
// equilibrium contact charge. Everything that can underflow is carried as a log10 as well.
import { H_PLANCK_J_S, K_BOLTZMANN_J_PER_K, M_ELECTRON_KG, Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';

/** One hour: exchange slower than this is unlikely to equilibrate during a typical pretreatment or test. */
export const SLOW_EXCHANGE_THRESHOLD_S = 3600;

/**
 * Effective Richardson constant A* = 4 pi q m* k^2 / h^3 (Richardson–Dushman), A m^-2 K^-2.
 * massRatio = m_eff/m0 (m* in units of the free-electron mass), the tunnelling/density-of-states effective mass of the support's majority carrier.
 */
export function richardsonConstant_A_per_m2_K2(massRatio: number): number {
  requireInRange('massRatio', massRatio, 1e-3, 100, '(m_eff/m0)');
  const effectiveMass_kg = massRatio * M_ELECTRON_KG;
  return (4 * Math.PI * Q_ELEMENTARY_C * effectiveMass_kg * K_BOLTZMANN_J_PER_K ** 2) / H_PLANCK_J_S ** 3;
}

export interface ThermionicInput {
  /** m_eff/m0, effective mass in units of the free-electron mass */
  massRatio: number;
  temperature_K: number;
  /** barrier height seen by the majority carrier, eV */
  barrier_eV: number;
}

export interface ThermionicExchange {
  richardsonConstant_A_per_m2_K2: number;
  /** exchange current density; 0 when it underflows a double (see log10) */
  current_A_per_m2: number;
  /** log10 of the exchange current density in A/m^2, always finite */
  log10Current_A_per_m2: number;
}

/**
 * Equilibrium thermionic exchange current J0 = A* T^2 exp(-Phi_B / kT) (Richardson–Dushman).
 * Computed as a logarithm first so a 3 eV barrier at room temperature gives a finite log10 and a clean 0,
 * never NaN.
 */
export function thermionicExchangeCurrent_A_per_m2(input: ThermionicInput): ThermionicExchange {
  const richardson = richardsonConstant_A_per_m2_K2(input.massRatio);
  requireInRange('temperature_K', input.temperature_K, 1, 5000, 'K');
  requireInRange('barrier_eV', input.barrier_eV, 0, 20, 'eV');
  const lnCurrent =
    Math.log(richardson) + 2 * Math.log(input.temperature_K) - input.barrier_eV / thermalEnergy_eV(input.temperature_K);
  return {
    richardsonConstant_A_per_m2_K2: richardson,
    current_A_per_m2: Math.exp(lnCurrent),
    log10Current_A_per_m2: lnCurrent / Math.LN10,
  };
}

export interface EquilibrationInput {
  /** equilibrium contact charge per interface area, C/m^2 (sign ignored) */
  charge_C_per_m2: number;
  /** exchange current density, A/m^2; may be 0 after underflow if log10 is given */
  exchangeCurrent_A_per_m2?: number;
  /** log10 of the exchange current density in A/m^2; preferred when given because it never underflows */
  log10ExchangeCurrent_A_per_m2?: number;
}

export interface EquilibrationTime {
  /** |Q| / J0 in seconds; Number.POSITIVE_INFINITY only when it overflows a double (then saturated = true) */
  seconds: number;
  /** log10 of the time in seconds; -Infinity for zero charge, +Infinity only if J0 = 0 was given without a log */
  log10Seconds: number;
  /** true when seconds is not representable as a finite double */
  saturated: boolean;
}

/**
 * Time to build the equilibrium charge at the exchange current, tau = |Q| / J0.
 * An order-of-magnitude estimate: the net current falls as equilibrium is approached, so the true
 * approach is slower than this linear ramp, but the exponential dependence on the barrier dominates.
 */
export function equilibrationTime_s(input: EquilibrationInput): EquilibrationTime {
  // any finite charge is accepted: extreme (unphysical) Boltzmann accumulation layers still get a finite time
  const charge = Math.abs(requireInRange('charge_C_per_m2', input.charge_C_per_m2, -Number.MAX_VALUE, Number.MAX_VALUE, 'C/m^2'));
  let log10Current: number;
  if (input.log10ExchangeCurrent_A_per_m2 !== undefined) {
    log10Current = requireInRange('log10ExchangeCurrent_A_per_m2', input.log10ExchangeCurrent_A_per_m2, -1e9, 1e9, '(log10 A/m^2)');
  } else if (input.exchangeCurrent_A_per_m2 !== undefined) {
    const current = input.exchangeCurrent_A_per_m2;
    if (!Number.isFinite(current) || current < 0) {
      throw new InputError('exchangeCurrent_A_per_m2', `value ${current} A/m^2 is not a finite non-negative number`, '0 or more A/m^2');
    }
    log10Current = current > 0 ? Math.log10(current) : Number.NEGATIVE_INFINITY;
  } else {
    throw new InputError('exchangeCurrent_A_per_m2', 'missing value', 'give exchangeCurrent_A_per_m2 or log10ExchangeCurrent_A_per_m2');
  }
  if (charge === 0) return { seconds: 0, log10Seconds: Number.NEGATIVE_INFINITY, saturated: false };
  if (log10Current === Number.NEGATIVE_INFINITY) {
    return { seconds: Number.POSITIVE_INFINITY, log10Seconds: Number.POSITIVE_INFINITY, saturated: true };
  }
  const log10Seconds = Math.log10(charge) - log10Current;
  const seconds = 10 ** log10Seconds;
  return { seconds, log10Seconds, saturated: !Number.isFinite(seconds) };
}

/** Exchange is "slow" when building the equilibrium charge takes longer than an hour. */
export function slowExchange(tau: number | EquilibrationTime): boolean {
  const seconds = typeof tau === 'number' ? tau : tau.seconds;
  if (Number.isNaN(seconds) || seconds < 0) {
    throw new InputError('equilibrationTime_s', `value ${seconds} s is not a non-negative time`, '0 s or more');
  }
  return seconds > SLOW_EXCHANGE_THRESHOLD_S;
}
