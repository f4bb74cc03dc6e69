// Electron exchange across the metal/support barrier (thermionic emission, thermionic-field and field emission
// through the computed barrier) and the time the contact charge takes to relax to equilibrium (issue 10, item 3).
// Everything that can underflow is carried as a log10 as well.
import { EPS0_F_PER_M, H_PLANCK_J_S, K_BOLTZMANN_J_PER_K, M_ELECTRON_KG, Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { ConvergenceError, InputError, requireInRange } from '../errors.js';
import type { ChargeModel } from '../bulk/equilibrium.js';
import { GL5_NODES, GL5_WEIGHTS } from '../electrostatics/gaussLegendre.js';
import { displacementOfField, fieldOfDisplacement, fieldOfEnergyDensity, isLinear, type DielectricLaw } from '../electrostatics/permittivity.js';

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
 * DEPRECATED (kept for existing callers): |Q| / J0, the time to build the charge at the exchange current.
 * Issue 10 item 3: this is 28-79x too long for typical contacts, because far from equilibrium the net current is
 * much larger than J0. Use relaxationTime99_s.
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

// ---------------------------------------------------------------------------------------------------------------
// Issue 10, item 3: exchange through the computed barrier, and the relaxation of the contact charge.

const HBAR_J_S = H_PLANCK_J_S / (2 * Math.PI);

/**
 * Characteristic tunnelling energy of a uniformly doped depletion barrier (Padovani & Stratton, Solid-State
 * Electron. 9, 695 (1966); as quoted by Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3, tunnelling
 * current; formula from memory, verify):
 *   E00 = (q hbar / 2) sqrt(N / (m* eps_s))        [returned in eV]
 * N: net fixed charge density of the depletion layer, m^-3 (>= 0; |Z N_D - N_A|, see derived/widths.ts);
 * massRatio: tunnelling effective mass m_eff/m0 (1e-3..100); relativePermittivity: static eps_r (1..1e5).
 * Thermionic emission dominates for E00 << kT, thermionic-field emission for E00 ~ kT, field emission for
 * E00 >> kT.
 */
export function tunnellingEnergy_eV(density_m3: number, massRatio: number, relativePermittivity: number): number {
  requireInRange('density_m3', density_m3, 0, 1e30, 'm^-3');
  requireInRange('massRatio', massRatio, 1e-3, 100, '(m_eff/m0)');
  requireInRange('relativePermittivity', relativePermittivity, 1, 1e5, '');
  const joules = ((Q_ELEMENTARY_C * HBAR_J_S) / 2) * Math.sqrt(density_m3 / (massRatio * M_ELECTRON_KG * relativePermittivity * EPS0_F_PER_M));
  return joules / Q_ELEMENTARY_C;
}

/**
 * Slope energy of the forward current law, E0 = E00 coth(E00 / kT) (Padovani & Stratton 1966, as above; from
 * memory, verify). E0 -> kT (thermionic) for E00 << kT, E0 -> E00 (field emission) for E00 >> kT. eV, >= kT.
 */
export function forwardSlopeEnergy_eV(tunnellingEnergy: number, kT_eV: number): number {
  requireInRange('tunnellingEnergy_eV', tunnellingEnergy, 0, 100, 'eV');
  requireInRange('kT_eV', kT_eV, 1e-6, 1, 'eV');
  const r = tunnellingEnergy / kT_eV;
  if (r < 1e-4) return kT_eV * (1 + (r * r) / 3); // series of r coth r
  if (r > 40) return tunnellingEnergy; // coth r = 1 to double precision
  return tunnellingEnergy / Math.tanh(r);
}

/**
 * Current-voltage law used for the relaxation (net electron current from the support into the metal, A/m^2),
 *   J(V) = J0 exp(q V / E0) (1 - exp(-q V / kT))
 * the thermionic-field form of Padovani & Stratton (1966) (Rhoderick & Williams, Metal-Semiconductor Contacts, 2nd
 * ed., ch. 3; from memory, verify). V = V_bb,eq - V_bb (eV): the band bending's deficit from equilibrium, i.e. the
 * forward bias the un-equilibrated contact is under. It reduces to thermionic emission J0 (e^{qV/kT} - 1) for
 * E0 = kT, and to the linear response J0 qV/kT for |V| << kT whatever E0, which is what defines J0 (the
 * exchange current, see exchangeCurrentThroughProfile). Returned relative to J0 (multiply by J0), so that an
 * underflowed J0 never turns the law into 0/0. |V| <= 100 eV; huge forward biases saturate at 1e300.
 */
export function relativeCurrent(bias_eV: number, kT_eV: number, slopeEnergy_eV: number): number {
  const x = bias_eV / slopeEnergy_eV;
  const y = -bias_eV / kT_eV;
  // exp(x) (1 - exp(y)) = exp(x) * (-expm1(y)), computed in logs where it would overflow
  if (bias_eV === 0) return 0;
  const factor = -Math.expm1(y); // > 0 for V > 0, < 0 for V < 0
  const logMagnitude = x + Math.log(Math.abs(factor));
  return Math.sign(factor) * Math.exp(Math.min(logMagnitude, 690));
}

/**
 * ln of the integral of the Fermi function over reduced energies, ln int_a^b dz / (1 + e^z) (a < b; z = E/kT), from
 * its antiderivative -ln(1 + e^-z): softplus(-a) - softplus(-b). For a > 30 the difference is taken in logs,
 * -a + ln(1 - e^-(b-a)), whose relative error is below e^-a < 1e-13, so it never underflows.
 */
export function logFermiIntegral(a: number, b: number): number {
  if (!(b > a)) throw new InputError('b', `must exceed a = ${a}`, 'b > a');
  if (a > 30) return -a + Math.log1p(-Math.exp(-(b - a)));
  const softplusNeg = (z: number): number => (z < 0 ? -z + Math.log1p(Math.exp(z)) : Math.log1p(Math.exp(-z)));
  return Math.log(softplusNeg(a) - softplusNeg(b));
}

export interface ProfileExchangeInput {
  /** depth into the support, m, ascending from the interface (0) to the bulk */
  x_m: ArrayLike<number>;
  /** E_C(x) - E_F at the nodes, eV (at x = 0 it is the electron barrier seen from the metal) */
  conductionBandAboveFermi_eV: ArrayLike<number>;
  /** tunnelling and density-of-states effective mass m_eff/m0 */
  massRatio: number;
  temperature_K: number;
}

export interface ProfileExchange {
  /** exchange current J0 = kT/q dJ/dV at zero bias, A/m^2 (0 after underflow: see log10) */
  current_A_per_m2: number;
  log10Current_A_per_m2: number;
  /** the thermionic part alone, A* T^2 exp(-max E_C / kT), log10 A/m^2 */
  log10Thermionic_A_per_m2: number;
  /** J0 / thermionic: the enhancement by tunnelling (>= 1) */
  tunnellingEnhancement: number;
}

/**
 * Zero-bias exchange current through the computed barrier, thermionic emission over it plus tunnelling through it
 * (thermionic-field and field emission), in the linear-response (Landauer / Tsu-Esaki) form
 *   J0 = (A* T / k) int T(E) f(E) dE,    f = 1 / (1 + exp(E / kT)),  E measured from E_F,
 * integrated over energies above the bulk conduction-band edge (states on both sides), with the WKB transmission
 *   T(E) = exp(-2 int_{E_C(x) > E} sqrt(2 m* (E_C(x) - E)) / hbar dx),  T = 1 above the barrier top
 * (WKB: Padovani & Stratton, Solid-State Electron. 9, 695 (1966); Crowell & Rideout, Solid-State Electron. 12, 89
 * (1969)). For an opaque barrier it reduces to Richardson–Dushman A* T^2 exp(-Phi_B / kT). Units: SI; E in eV.
 * The profile between nodes is taken as linear (exact WKB integral of sqrt of a linear function on each cell).
 * Returns J0 and its log10 (always finite).
 */
export function exchangeCurrentThroughProfile(input: ProfileExchangeInput): ProfileExchange {
  const x = input.x_m;
  const ec = input.conductionBandAboveFermi_eV;
  const n = x.length;
  if (n < 2 || ec.length !== n) throw new InputError('x_m', `profile needs >= 2 nodes and matching arrays, got ${n} and ${ec.length}`, '>= 2 nodes');
  requireInRange('temperature_K', input.temperature_K, 1, 5000, 'K');
  const richardson = richardsonConstant_A_per_m2_K2(input.massRatio);
  const kT = thermalEnergy_eV(input.temperature_K);
  let top = -Infinity;
  for (let i = 0; i < n; i++) {
    const e = requireInRange('conductionBandAboveFermi_eV', ec[i]!, -50, 50, 'eV');
    if (e > top) top = e;
    if (i > 0 && !(x[i]! > x[i - 1]!)) throw new InputError('x_m', 'depths must increase strictly', 'ascending depths');
  }
  const bottom = ec[n - 1]!;
  // 2 sqrt(2 m*) / hbar in 1/(m sqrt(eV))
  const kappaScale = (2 * Math.sqrt(2 * input.massRatio * M_ELECTRON_KG * Q_ELEMENTARY_C)) / HBAR_J_S;
  // highest E_C from node i to the bulk: cells from the first i with tailTop[i] <= E on are allowed (no term)
  const tailTop = new Float64Array(n);
  tailTop[n - 1] = ec[n - 1]!;
  for (let i = n - 2; i >= 0; i--) tailTop[i] = Math.max(ec[i]!, tailTop[i + 1]!);
  /** ln T(E): exact integral of sqrt(E_C - E) over each cell with linear E_C */
  const logTransmission = (energy: number): number => {
    if (energy >= top) return 0;
    let integral = 0;
    for (let i = 0; i < n - 1 && tailTop[i]! > energy; i++) {
      const a = ec[i]! - energy;
      const b = ec[i + 1]! - energy;
      if (a <= 0 && b <= 0) continue;
      const h = x[i + 1]! - x[i]!;
      if (a > 0 && b > 0) {
        // int_0^h sqrt(a + (b - a) t/h) dt = (2h/3) (b^1.5 - a^1.5) / (b - a)
        integral += Math.abs(b - a) < 1e-12 * (a + b) ? h * Math.sqrt(0.5 * (a + b)) : ((2 * h) / 3) * (b * Math.sqrt(b) - a * Math.sqrt(a)) / (b - a);
      } else {
        // only part of the cell is forbidden: the turning point at the zero of the linear function
        const positive = Math.max(a, b);
        const length = (h * positive) / (positive - Math.min(a, b));
        integral += ((2 * length) / 3) * Math.sqrt(positive);
      }
    }
    return -kappaScale * integral;
  };
  // energy grid: from the bulk band edge (or 40 kT below E_F, where f ~ 1 and tunnelling from deep metal states is
  // negligible against the transmission) to 40 kT above the barrier top. Below the top: Gauss–Legendre on pieces of
  // kT/2. Above it T = 1 and the integral of the Fermi function is exact (logFermiIntegral); the transmission's kink
  // at the top is where the two parts meet.
  const lower = Math.max(bottom, Math.min(top, 0) - 40 * kT);
  const upper = top + 40 * kT;
  const below = Math.min(2000, Math.max(top > lower ? 8 : 0, Math.ceil((top - lower) / (0.5 * kT))));
  // accumulate sum exp(term - logMax) with a running maximum (log-sum-exp) so nothing underflows
  let logMax = -Infinity;
  let scaled = 0;
  const add = (term: number): void => {
    if (term > logMax) {
      scaled = scaled * Math.exp(logMax - term) + 1;
      logMax = term;
    } else scaled += Math.exp(term - logMax);
  };
  add(Math.log(kT) + logFermiIntegral(top / kT, upper / kT));
  // below the top, piece by piece downwards from the top. T(E) only falls with E (the forbidden stretch grows and
  // E_C - E with it) and f <= 1, so everything below the lowest node done so far adds at most (its distance from
  // `lower`) x T(that node): once that is under e^-40 (4e-18) of the sum, below the last bit of a double, the
  // remaining pieces are skipped. Deep below the top they are the costly ones (longest forbidden stretches).
  const width = below > 0 ? (top - lower) / below : 0;
  for (let p = below - 1; p >= 0; p--) {
    const mid = lower + (p + 0.5) * width;
    let lowestLogT = 0;
    for (let k = 0; k < 5; k++) {
      const e = mid + 0.5 * width * GL5_NODES[k]!;
      // ln f(E) = -softplus(E/kT)
      const z = e / kT;
      const logF = -(z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z)));
      const logT = logTransmission(e);
      lowestLogT = k === 0 ? logT : Math.min(lowestLogT, logT); // GL5_NODES[0] is the lowest node of the piece
      add(logT + logF + Math.log(GL5_WEIGHTS[k]! * 0.5 * width));
    }
    const skippedWidth = p * width;
    if (skippedWidth > 0 && Math.log(skippedWidth) + lowestLogT < logMax + Math.log(scaled) - 40) break;
  }
  // J0 = A* T^2 (1/kT) int T f dE
  const lnJ = Math.log(richardson) + 2 * Math.log(input.temperature_K) - Math.log(kT) + logMax + Math.log(scaled);
  const lnThermionic = Math.log(richardson) + 2 * Math.log(input.temperature_K) - Math.max(top, 0) / kT;
  if (!Number.isFinite(lnJ)) throw new ConvergenceError('exchange current integral is not finite', 0);
  return {
    current_A_per_m2: Math.exp(lnJ),
    log10Current_A_per_m2: lnJ / Math.LN10,
    log10Thermionic_A_per_m2: lnThermionic / Math.LN10,
    tunnellingEnhancement: Math.exp(Math.min(690, Math.max(0, lnJ - lnThermionic))),
  };
}

/** Width of the quadrature pieces of planarChargeOfBending, in units of kT (band bending / kT). */
const CHARGE_PIECE_kT = 0.5;

/**
 * Planar space charge as a function of the band bending, Q(V) = sign(V) sqrt(2 eps kT int_0^u (N(xi_b - v) -
 * N(xi_b)) dv), u = V/kT (first integral; Sze & Ng, 3rd ed., ch. 4). Returns a function of V (eV) giving C/m^2;
 * 5-point Gauss–Legendre on pieces kT/2 wide on a fixed grid (u = 0, ±1/2, ±1, ...) whose running sums are kept,
 * so a call costs one partial piece (5 charge-model calls) instead of a whole quadrature from 0: the relaxation
 * time asks for Q about 450 times. Accuracy as before (the same rule on pieces of the same width; against the
 * Boltzmann closed form in test/exchange.test.ts); values differ from the former per-call grid by rounding only.
 * For curved geometries pass your own Q(V) instead. With a field-dependent dielectric (`dielectric`, zero-field value
 * relativePermittivity) the same integral is the field energy W(E_s) = kT int g and Q = D(E_s) (src/electrostatics/
 * permittivity.ts); dQ/dV = q g / E_s.
 */
export interface ChargeOfBending {
  /** Q(V), C/m^2 */
  (bandBending_eV: number): number;
  /**
   * dQ/dV, C/(m^2 eV), exact from the same first integral: Q^2 = P int_0^u g, so dQ/du = P g(u) / (2 Q) with
   * g(u) = N(xi_b - u) - N(xi_b) (one charge-model call besides Q); undefined at Q = 0 (flat bands), where the caller
   * differentiates numerically.
   */
  capacitance(bandBending_eV: number): number | undefined;
}

export function planarChargeOfBending(
  model: ChargeModel,
  bulkReducedFermiLevel: number,
  relativePermittivity: number,
  temperature_K: number,
  dielectric?: DielectricLaw,
): ChargeOfBending {
  const law = dielectric !== undefined && !isLinear(dielectric) ? dielectric : null;
  const thermal_J = K_BOLTZMANN_J_PER_K * temperature_K;
  const out = new Float64Array(2);
  model.netCharge(bulkReducedFermiLevel, out);
  const residue = out[0]!;
  const prefactor = 2 * relativePermittivity * EPS0_F_PER_M * K_BOLTZMANN_J_PER_K * temperature_K;
  /** int_{t0}^{t1} (N(xi_b - s t) - N(xi_b)) dt, 5-point Gauss–Legendre (one piece) */
  const piece = (s: number, t0: number, t1: number): number => {
    const mid = 0.5 * (t0 + t1);
    const half = 0.5 * (t1 - t0);
    let sum = 0;
    for (let k = 0; k < 5; k++) {
      model.netCharge(bulkReducedFermiLevel - s * (mid + half * GL5_NODES[k]!), out);
      sum += GL5_WEIGHTS[k]! * (out[0]! - residue);
    }
    return half * sum;
  };
  // running sums over whole pieces, for u > 0 ([0]) and u < 0 ([1]): sums[d][j] = int over the first j pieces
  const sums: [number[], number[]] = [[0], [0]];
  const charge = (bandBending_eV: number): number => {
    const u = bandBending_eV / model.kT_eV;
    if (u === 0) return 0;
    const s = Math.sign(u);
    const a = Math.abs(u);
    const table = sums[s > 0 ? 0 : 1];
    const whole = Math.floor(a / CHARGE_PIECE_kT);
    for (let j = table.length - 1; j < whole; j++) table.push(table[j]! + piece(s, j * CHARGE_PIECE_kT, (j + 1) * CHARGE_PIECE_kT));
    const start = whole * CHARGE_PIECE_kT;
    // int_0^u g dv = s int_0^|u| g(s t) dt
    const integral = s * (table[whole]! + (a > start ? piece(s, start, a) : 0));
    if (law !== null) return s * displacementOfField(law, fieldOfEnergyDensity(law, thermal_J * Math.max(0, integral)));
    return s * Math.sqrt(prefactor * Math.max(0, integral));
  };
  const capacitance = (bandBending_eV: number): number | undefined => {
    const q = charge(bandBending_eV);
    if (q === 0) return undefined;
    model.netCharge(bulkReducedFermiLevel - bandBending_eV / model.kT_eV, out);
    if (law !== null) {
      // dQ/du = (dD/dW) (dW/du) = (1 / E_s) kT g, i.e. per eV of bending q g / E_s, with E_s = E(D = Q)
      const field = Math.abs(fieldOfDisplacement(law, q));
      // g has the sign of Q (depletion and accumulation alike), so the capacitance is positive, as in the linear case
      return field > 0 ? (Q_ELEMENTARY_C * Math.abs(out[0]! - residue)) / field : undefined;
    }
    return (prefactor * (out[0]! - residue)) / (2 * q * model.kT_eV);
  };
  return Object.assign(charge, { capacitance });
}

export interface RelaxationInput {
  /** equilibrium band bending V_eq, eV (the contact starts from flat bands, V = 0, Q = 0) */
  equilibriumBending_eV: number;
  /** Q(V): space charge per interface area (C/m^2) at band bending V (eV); monotone increasing, Q(0) = 0 */
  chargeOfBending: (bandBending_eV: number) => number;
  /** dQ/dV, C/(m^2 eV), where known exactly (ChargeOfBending.capacitance); else Q is differentiated numerically */
  capacitanceOfBending?: ((bandBending_eV: number) => number | undefined) | undefined;
  /** log10 of the exchange current J0 in A/m^2 (from exchangeCurrentThroughProfile or the thermionic J0) */
  log10ExchangeCurrent_A_per_m2: number;
  temperature_K: number;
  /** slope energy E0 of the forward law (forwardSlopeEnergy_eV); default kT = pure thermionic emission */
  slopeEnergy_eV?: number;
  /** fraction of the equilibrium charge to reach, default 0.99 */
  fraction?: number;
}

export interface RelaxationTime {
  /** seconds (saturated at Number.MAX_VALUE, never Infinity) */
  seconds: number;
  /** log10 of the time in seconds, always finite */
  log10Seconds: number;
  /** linearised time constant tau = C kT / (q J0) with C = dQ/dV at equilibrium, log10 s */
  log10LinearTau_s: number;
}

/**
 * Time for the contact charge to reach `fraction` (default 99%) of its equilibrium value, from flat bands, by
 * integrating the relaxation dQ/dt = J(V_eq - V(Q)) (J: relativeCurrent x J0; positive = electrons into the metal
 * = support charge grows):
 *   t = int_0^{V_f} (dQ/dV) / J(V_eq - V) dV,   Q(V_f) = fraction Q_eq
 * with the substitution V = V_eq - s e^w so the 1/(V_eq - V) behaviour near equilibrium is integrated smoothly
 * (composite Gauss–Legendre in w, 40 panels). Linear limit (|V_eq| << kT, Q linear in V): t = tau ln(1/(1-fraction)),
 * tau = C kT / (q J0) (capacitor discharging through the zero-bias conductance q J0 / kT).
 * Units: seconds; log10 always finite. Throws InputError for out-of-range inputs.
 */
export function relaxationTime99_s(input: RelaxationInput): RelaxationTime {
  const kT = thermalEnergy_eV(requireInRange('temperature_K', input.temperature_K, 1, 5000, 'K'));
  const veq = requireInRange('equilibriumBending_eV', input.equilibriumBending_eV, -50, 50, 'eV');
  const logJ0 = requireInRange('log10ExchangeCurrent_A_per_m2', input.log10ExchangeCurrent_A_per_m2, -1e9, 1e9, '(log10 A/m^2)');
  const e0 = requireInRange('slopeEnergy_eV', input.slopeEnergy_eV ?? kT, kT * (1 - 1e-12), 100, 'eV');
  const fraction = requireInRange('fraction', input.fraction ?? 0.99, 0.01, 0.999999, '');
  const q = input.chargeOfBending;
  const qeq = q(veq);
  const dv = 1e-4 * Math.max(Math.abs(veq), kT);
  // C/(m^2 eV) = C/(m^2 V): exact where the caller knows it, else a central difference
  const capacitanceAt = (v: number): number => input.capacitanceOfBending?.(v) ?? (q(v + dv) - q(v - dv)) / (2 * dv);
  const capEq = capacitanceAt(veq);
  const log10Tau = Math.log10(Math.max(capEq, 1e-300) * kT) - logJ0; // C kT/q / J0 with kT/q in volts = kT in eV
  if (veq === 0 || qeq === 0) return { seconds: 0, log10Seconds: -308, log10LinearTau_s: log10Tau };
  // V_f by bisection on Q(V) = fraction Q_eq between 0 and V_eq (Q monotone)
  let lo = 0;
  let hi = veq;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (Math.abs(q(mid)) < fraction * Math.abs(qeq)) lo = mid;
    else hi = mid;
    if (Math.abs(hi - lo) <= 1e-15 * Math.abs(veq)) break;
  }
  const vf = 0.5 * (lo + hi);
  const s = Math.sign(veq);
  // w from ln|V_eq| (V = 0) down to ln|V_eq - V_f|; integrand (dQ/dV) e^w / |J/J0|, dV = -s e^w dw
  const w0 = Math.log(Math.abs(veq));
  const w1 = Math.log(Math.abs(veq - vf));
  const panels = 40;
  const h = (w0 - w1) / panels;
  let integral = 0; // units: C/m^2 per (J/J0)
  for (let p = 0; p < panels; p++) {
    const mid = w1 + (p + 0.5) * h;
    for (let k = 0; k < 5; k++) {
      const w = mid + 0.5 * h * GL5_NODES[k]!;
      const deficit = Math.exp(w); // |V_eq - V|
      const v = veq - s * deficit;
      const current = Math.abs(relativeCurrent(s * deficit, kT, e0));
      integral += 0.5 * h * GL5_WEIGHTS[k]! * (capacitanceAt(v) * deficit) / Math.max(current, 1e-300);
    }
  }
  const log10Seconds = Math.log10(Math.max(integral, 1e-300)) - logJ0;
  const clamped = Math.min(Math.max(log10Seconds, -308), 308);
  return { seconds: Math.min(10 ** clamped, Number.MAX_VALUE), log10Seconds: clamped, log10LinearTau_s: log10Tau };
}
