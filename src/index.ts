// Public library API of bandbend. `import { solveContact } from 'bandbend'`.
export { solveContact, solveResolved, MAX_BAND_BENDING_EV } from './contact.js';
export type { ContactOptions, ResolvedContact } from './inputs/contactInput.js';
export { resolveContact } from './inputs/contactInput.js';
export { PARAMETERS, parameterOf, type ParameterRow, type OptionName } from './inputs/parameters.js';
export type * from './types.js';
export { InputError, ConvergenceError } from './errors.js';
export { parseQuantity, type QuantityInput, type QuantityKind } from './inputs/units.js';

// materials
export { loadLibrary, loadBuiltinLibrary, findMetal, findSupport, formatCitation } from './materials/load.js';
export { estimateElectronAffinity } from './materials/estimate.js';
export type { MaterialsLibrary, MetalRecord, SupportRecord, PropertyValue, CslItem, InputProvenance } from './materials/types.js';

// physics building blocks
export { fermiDiracHalf, fermiDiracMinusHalf, logFermiDiracHalf } from './bulk/fermiDirac.js';
export { makeChargeModel, solveBulkNeutrality, effectiveDensityOfStates_m3 } from './bulk/equilibrium.js';
export type { ChargeModel, BulkState, SupportElectronic, DonorSpec, AcceptorSpec } from './bulk/equilibrium.js';
export { barrierHeight, empiricalPinningFactor, imageForceLowering_eV } from './barrier/barrier.js';
export { solvePoisson } from './electrostatics/poisson.js';
export type { PoissonProblem, PoissonSolution } from './electrostatics/poisson.js';
export { PLANAR, disc, discArray, hemisphere, particleArray, crossSectionFromFunction, type CrossSection } from './electrostatics/geometry.js';
export { particleAtoms, chargingEnergy_eV, meanSpacing_m } from './derived/particle.js';
export { thermionicExchangeCurrent_A_per_m2, equilibrationTime_s, richardsonConstant_A_per_m2_K2 } from './derived/exchange.js';
export { fitMottSchottky, parseCapacitanceCsv } from './derived/mottSchottky.js';
export { propagateUncertainty, seededRandom } from './derived/uncertainty.js';
export { donorsForFermiLevel } from './derived/fermiLevel.js';
export { WARNING_RULES, evaluateWarnings, type WarningFacts, type WarningRule } from './derived/warnings.js';
export { vacancyDonorDensity, oxygenPressureFromHydrogenWater, waterGibbsFormation_kJ_mol, HYDROGEN_CAUTIONS } from './inputs/pretreatment.js';

// workflows and output
export { runScreen, type ScreenOptions, type ScreenRow } from './screen.js';
export { runStudy, type RunStudyOptions, type StudySummary } from './study/runner.js';
export { parseStudy, loadStudyFile, type Study } from './study/studyFile.js';
export { writeContactReport, writeScreenReport, writeStudyReport } from './output/report.js';
export { bandDiagramSpec, chargeFieldSpec, heatmapSpec, linePlotSpec } from './output/figures.js';
export { renderSvg } from './output/render.js';
export { formatContactSummary } from './output/summary.js';
export { writeStudyPlots } from './output/studyPlots.js';
export { formatNumber, formatQuantity } from './output/format.js';
export { SCREENING_CAUTION, contactCautions } from './output/cautions.js';

// validation against published measurements
export { runValidation, type ValidationOptions, type ValidationResult, type ValidationRow, type ValidationStatistics } from './validation/gallery.js';
export { writeValidationReport, type ValidationReportPaths } from './validation/report.js';
export { observedBandBending_eV, bandBendingProfile, seahDenchImfpCompound_m, kineticEnergy_eV, monolayerThickness_m } from './derived/photoemission.js';
