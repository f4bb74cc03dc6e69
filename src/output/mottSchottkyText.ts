// The Mott–Schottky fit for the terminal.
import type { fitMottSchottky } from '../derived/mottSchottky.js';

/** The fit in words and numbers, with the flag that takes the support work function. */
export function formatFit(fit: ReturnType<typeof fitMottSchottky>): string {
  const lines = [
    `Mott-Schottky fit (${fit.points} points, R^2 = ${fit.rSquared.toFixed(5)})`,
    `  carrier type              ${fit.carrierType}-type${fit.slopeSignificant ? '' : ' (slope not significant: type uncertain)'}`,
    `  ${(fit.carrierType === 'n' ? 'donor density' : 'acceptor density').padEnd(26)}${fit.dopantDensity_cm3.toExponential(3)} +/- ${fit.dopantDensityStdErr_cm3.toExponential(2)} cm^-3`,
    `  flat-band potential       ${fit.flatBandPotential_V.toFixed(4)} +/- ${fit.flatBandStdErr_V.toFixed(4)} V vs ${fit.reference}`,
    `  flat-band potential (SHE) ${fit.flatBandPotential_V_SHE.toFixed(4)} V`,
    `  Fermi level vs vacuum     ${fit.fermiLevelVsVacuum_eV.toFixed(3)} eV (absolute SHE 4.44 V, Trasatti 1986)`,
    `  support work function     ${fit.supportWorkFunction_eV.toFixed(3)} eV  (use as --support-work-function)`,
    `  (save this fit with --json and give it to \`bandbend contact --fit-from FILE\`: donor density and permittivity)`,
  ];
  return `${lines.join('\n')}\n`;
}

