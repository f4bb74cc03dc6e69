// zod schemas for the materials files (materials/metals.json, supports.json, references.json and
// user files given with --materials). The file format is ours; the loader turns parsed entries into
// the MetalRecord / SupportRecord / CslItem shapes of ./types.ts.
//
// Checks made here, per field: types, finite numbers, min <= value <= max, physical ranges.
// Checks made in load.ts (they need the whole library): every `source` resolves to a reference,
// unique names.
//
// zod is loaded on first use (`materialsSchemas()`), not at import: the built-in library is validated by
// test/materials.test.ts and trusted at run time, so `contact --json` never pays for loading zod.
import { createRequire } from 'node:module';
import type { z as Z } from 'zod';

type ZodNamespace = typeof Z;

/** Physical bounds of one property; `unit` is used in messages only. */
interface Bounds {
  lo: number;
  hi: number;
  unit: string;
  /** true when the lower bound itself is not allowed (masses > 0) */
  exclusiveLo?: boolean;
}

function describeBounds(b: Bounds): string {
  const lo = b.exclusiveLo ? `above ${b.lo}` : `${b.lo}`;
  return `${lo} to ${b.hi}${b.unit ? ' ' + b.unit : ''}`;
}

function inBounds(v: number, b: Bounds): boolean {
  return (b.exclusiveLo ? v > b.lo : v >= b.lo) && v <= b.hi;
}

/** Physical ranges used by the schemas (wide on purpose: they catch unit slips and typos, not outliers). */
export const BOUNDS = {
  workFunction_eV: { lo: 1, hi: 7, unit: 'eV' },
  density_g_cm3: { lo: 0.1, hi: 30, unit: 'g/cm^3' },
  molarMass_g_mol: { lo: 1, hi: 300, unit: 'g/mol' },
  metallicRadius_pm: { lo: 30, hi: 300, unit: 'pm' },
  electronAffinity_eV: { lo: 0, hi: 8, unit: 'eV' },
  bandGap_eV: { lo: 0.01, hi: 12, unit: 'eV' },
  staticPermittivity: { lo: 1, hi: 1e5, unit: '' },
  opticalPermittivity: { lo: 1, hi: 100, unit: '' },
  permittivityNonlinearity: { lo: 0, hi: 1e13, unit: 'V m^5 C^-3' },
  curieWeissTemperature_K: { lo: 0, hi: 250, unit: 'K' },
  mass_me: { lo: 0, hi: 100, unit: 'm_e', exclusiveLo: true },
  level_eV: { lo: 0, hi: 12, unit: 'eV' },
  density_cm3: { lo: 1, hi: 1e24, unit: 'cm^-3' },
  neutralLevel_eV: { lo: 0, hi: 12, unit: 'eV' },
  pinningFactor: { lo: 0, hi: 1, unit: '' },
  enthalpy_eV: { lo: 0, hi: 20, unit: 'eV' },
  entropy_kB: { lo: -100, hi: 100, unit: 'k_B' },
  oxygenSites_cm3: { lo: 1e20, hi: 1e24, unit: 'cm^-3' },
  chargeNeutralityAboveValence_eV: { lo: 0, hi: 12, unit: 'eV' },
  interfaceLayerThickness_nm: { lo: 0, hi: 100, unit: 'nm', exclusiveLo: true },
  interfaceLayerPermittivity: { lo: 1, hi: 1e5, unit: '' },
  localisedLevel_eV: { lo: 0, hi: 12, unit: 'eV' },
  diffusionPrefactor_cm2_s: { lo: 0, hi: 1e6, unit: 'cm^2/s', exclusiveLo: true },
  activation_eV: { lo: 0, hi: 20, unit: 'eV' },
  densityOfStates_per_eV_atom: { lo: 0, hi: 50, unit: 'states/(eV atom)', exclusiveLo: true },
  sizeWorkFunctionCoefficient: { lo: 0, hi: 2, unit: '' },
} satisfies Record<string, Bounds>;

type Primitives = ReturnType<typeof primitives>;

function primitives(z: ZodNamespace) {
  const finiteNumber = z
    .number({ invalid_type_error: 'expected a number', required_error: 'required' })
    .finite({ message: 'expected a finite number' });

  /** A PropertyValue whose value, min and max must lie inside `b`, and min <= value <= max. */
  function propertyValue(b: Bounds) {
    return z
      .object({
        value: finiteNumber,
        min: finiteNumber.optional(),
        max: finiteNumber.optional(),
        source: z.string({ invalid_type_error: 'expected a reference id (string)', required_error: 'required' }).min(1, 'must not be empty'),
        note: z.string({ invalid_type_error: 'expected a string' }).optional(),
        fromMemory: z.boolean({ invalid_type_error: 'expected true or false' }).optional(),
      })
      .strict()
      .superRefine((pv, ctx) => {
        for (const key of ['value', 'min', 'max'] as const) {
          const v = pv[key];
          if (v !== undefined && !inBounds(v, b)) {
            ctx.addIssue({ code: z.ZodIssueCode.custom, path: [key], message: `${v} is out of range (allowed: ${describeBounds(b)})` });
          }
        }
        if (pv.min !== undefined && pv.min > pv.value) {
          ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['min'], message: `min ${pv.min} is above value ${pv.value}` });
        }
        if (pv.max !== undefined && pv.max < pv.value) {
          ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['max'], message: `max ${pv.max} is below value ${pv.value}` });
        }
      });
  }


  const name = z
    .string({ invalid_type_error: 'expected a string', required_error: 'required' })
    .min(1, 'must not be empty')
    .max(60, 'too long (60 characters at most)')
    .regex(/^[A-Za-z0-9().,+\-_ ]+$/, 'use letters, digits and ( ) . , + - _ only');

  const text = z.string({ invalid_type_error: 'expected a string', required_error: 'required' }).min(1, 'must not be empty');

  return { finiteNumber, propertyValue, name, text };
}

function metalSchema(z: ZodNamespace, { propertyValue, name, text }: Primitives) {
  /** One metal entry as written in a file (MetalRecord without `kind`). */
  return z
    .object({
      name,
      fullName: text,
      workFunction_eV: propertyValue(BOUNDS.workFunction_eV),
      density_g_cm3: propertyValue(BOUNDS.density_g_cm3),
      molarMass_g_mol: propertyValue(BOUNDS.molarMass_g_mol),
      metallicRadius_pm: propertyValue(BOUNDS.metallicRadius_pm),
      densityOfStatesAtFermi_per_eV_atom: propertyValue(BOUNDS.densityOfStates_per_eV_atom).optional(),
      sizeWorkFunctionCoefficient: propertyValue(BOUNDS.sizeWorkFunctionCoefficient).optional(),
    })
    .strict();
}

function defectSchemas(z: ZodNamespace, { propertyValue, text }: Primitives) {
  const DefectLevelSchema = z
    .object({
      type: z.enum(['single', 'double'], { errorMap: () => ({ message: "expected 'single' or 'double'" }) }),
      level1_eV: propertyValue(BOUNDS.level_eV),
      level2_eV: propertyValue(BOUNDS.level_eV).optional(),
      label: text,
    })
    .strict()
    .superRefine((d, ctx) => {
      if (d.type === 'single' && d.level2_eV !== undefined) {
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['level2_eV'], message: "only a 'double' donor has a second level" });
      }
    });

  const AcceptorLevelSchema = z
    .object({
      level_eV: propertyValue(BOUNDS.level_eV),
      label: text,
    })
    .strict();

  const VacancyDiffusionSchema = z
    .object({
      prefactor_cm2_s: propertyValue(BOUNDS.diffusionPrefactor_cm2_s),
      activation_eV: propertyValue(BOUNDS.activation_eV),
      label: text.optional(),
    })
    .strict();

  const ReductionThermoSchema = z
    .object({
      enthalpy_eV: propertyValue(BOUNDS.enthalpy_eV),
      entropy_kB: propertyValue(BOUNDS.entropy_kB),
      oxygenSites_cm3: propertyValue(BOUNDS.oxygenSites_cm3),
      law: text.optional(),
      vacancyDiffusion: VacancyDiffusionSchema.optional(),
    })
    .strict();

  return { DefectLevelSchema, AcceptorLevelSchema, VacancyDiffusionSchema, ReductionThermoSchema };
}

/** The fields of a support entry that its cross-field checks read. */
interface SupportLevels {
  bandGap_eV: { value: number };
  staticPermittivity: { value: number };
  opticalPermittivity: { value: number };
  donor?: { level1_eV: { value: number }; level2_eV?: { value: number } | undefined } | undefined;
  acceptor?: { level_eV: { value: number } } | undefined;
  localisedLevel_eV?: { value: number } | undefined;
  chargeNeutralityAboveValence_eV?: { value: number } | undefined;
}

/** Cross-field physics of a support entry (zod superRefine body). */
function supportCrossChecks(s: SupportLevels, ctx: Z.RefinementCtx): void {
  // cross-field physics: electronic screening cannot exceed total screening; defect levels lie in the gap.
  // Checked only when the fields themselves are valid, so that one mistake gives one message.
  const valid = (v: number, b: Bounds) => inBounds(v, b);
  if (
    valid(s.opticalPermittivity.value, BOUNDS.opticalPermittivity) &&
    valid(s.staticPermittivity.value, BOUNDS.staticPermittivity) &&
    s.opticalPermittivity.value > s.staticPermittivity.value
  ) {
    ctx.addIssue({
      code: 'custom',
      path: ['opticalPermittivity', 'value'],
      message: `${s.opticalPermittivity.value} exceeds the static permittivity ${s.staticPermittivity.value}`,
    });
  }
  const gap = s.bandGap_eV.value;
  if (!valid(gap, BOUNDS.bandGap_eV)) return;
  const levels: [string[], number | undefined][] = [
    [['donor', 'level1_eV', 'value'], s.donor?.level1_eV.value],
    [['donor', 'level2_eV', 'value'], s.donor?.level2_eV?.value],
    [['acceptor', 'level_eV', 'value'], s.acceptor?.level_eV.value],
    [['localisedLevel_eV', 'value'], s.localisedLevel_eV?.value],
  ];
  for (const [path, v] of levels) {
    if (v !== undefined && v >= gap) {
      ctx.addIssue({ code: 'custom', path, message: `${v} eV is not inside the band gap (${gap} eV)` });
    }
  }
  // a charge-neutrality level may lie in the conduction band (In2O3, ZnO: surface electron accumulation),
  // but not more than the gap above it: that would be a unit slip (eV below vacuum given instead).
  const cnl = s.chargeNeutralityAboveValence_eV?.value;
  if (cnl !== undefined && cnl > 2 * gap) {
    ctx.addIssue({
      code: 'custom',
      path: ['chargeNeutralityAboveValence_eV', 'value'],
      message: `${cnl} eV is more than twice the band gap (${gap} eV) above the valence band (give the level above the valence-band maximum, not below vacuum)`,
    });
  }
}

function supportSchema(z: ZodNamespace, p: Primitives, d: ReturnType<typeof defectSchemas>) {
  const { propertyValue, name, text } = p;
  const { DefectLevelSchema, AcceptorLevelSchema, ReductionThermoSchema } = d;
  /** One support entry as written in a file (SupportRecord without `kind`). */
  return z
    .object({
      name,
      fullName: text,
      formula: z
        .string({ invalid_type_error: 'expected a string', required_error: 'required' })
        .regex(/^[A-Za-z0-9.()]+$/, 'expected a chemical formula such as "Ce0.8Zr0.2O2"'),
      electronAffinity_eV: propertyValue(BOUNDS.electronAffinity_eV),
      bandGap_eV: propertyValue(BOUNDS.bandGap_eV),
      staticPermittivity: propertyValue(BOUNDS.staticPermittivity),
      opticalPermittivity: propertyValue(BOUNDS.opticalPermittivity),
      electronMass_me: propertyValue(BOUNDS.mass_me),
      holeMass_me: propertyValue(BOUNDS.mass_me),
      conductionType: z.enum(['n', 'p', 'insulator'], { errorMap: () => ({ message: "expected 'n', 'p' or 'insulator'" }) }),
      donor: DefectLevelSchema.optional(),
      acceptor: AcceptorLevelSchema.optional(),
      typicalDensity_cm3: propertyValue(BOUNDS.density_cm3).optional(),
      neutralLevel_eV: propertyValue(BOUNDS.neutralLevel_eV).optional(),
      pinningFactor: propertyValue(BOUNDS.pinningFactor).optional(),
      chargeNeutralityAboveValence_eV: propertyValue(BOUNDS.chargeNeutralityAboveValence_eV).optional(),
      interfaceLayerThickness_nm: propertyValue(BOUNDS.interfaceLayerThickness_nm).optional(),
      interfaceLayerPermittivity: propertyValue(BOUNDS.interfaceLayerPermittivity).optional(),
      permittivityNonlinearity_V_m5_per_C3: propertyValue(BOUNDS.permittivityNonlinearity).optional(),
      curieWeissTemperature_K: propertyValue(BOUNDS.curieWeissTemperature_K).optional(),
      localisedSiteDensity_cm3: propertyValue(BOUNDS.density_cm3).optional(),
      localisedLevel_eV: propertyValue(BOUNDS.localisedLevel_eV).optional(),
      mottCriticalDensity_cm3: propertyValue(BOUNDS.density_cm3).optional(),
      reduction: ReductionThermoSchema.optional(),
    })
    .strict()
    .superRefine(supportCrossChecks);
}

function cslSchemas(z: ZodNamespace, { text }: Primitives) {
  const cslName = z
    .object({
      family: z.string().optional(),
      given: z.string().optional(),
      literal: z.string().optional(),
    })
    .strict();

  /** CSL-JSON item (the subset we use; other CSL fields such as container-title-short are kept). */
  const CslItemSchema = z
    .object({
      id: z
        .string({ invalid_type_error: 'expected a string', required_error: 'required' })
        .regex(/^[A-Za-z0-9_.:-]+$/, 'use letters, digits and _ . : - only'),
      type: text,
      title: text,
      author: z.array(cslName).optional(),
      'container-title': z.string().optional(),
      'container-title-short': z.string().optional(),
      volume: z.string({ invalid_type_error: 'expected a string (CSL-JSON writes volumes as strings)' }).optional(),
      page: z.string({ invalid_type_error: 'expected a string such as "4729-4733"' }).optional(),
      issued: z.object({ 'date-parts': z.array(z.array(z.union([z.number(), z.string()])).min(1)).min(1) }).strict().optional(),
      DOI: z.string().regex(/^10\.\d{4,9}\/\S+$/, 'expected a DOI such as 10.1063/1.323539').optional(),
      URL: z.string().url('expected a URL').optional(),
      edition: z.string().optional(),
      publisher: z.string().optional(),
      note: z.string().optional(),
    })
    .passthrough();

  const ReferencesFileSchema = z.array(CslItemSchema, { invalid_type_error: 'expected a CSL-JSON array' });

  return { CslItemSchema, ReferencesFileSchema };
}

/** Build every schema with the given zod namespace (once per process, see materialsSchemas). */
function makeSchemas(z: ZodNamespace) {
  const p = primitives(z);
  const MetalEntrySchema = metalSchema(z, p);
  const defects = defectSchemas(z, p);
  const SupportEntrySchema = supportSchema(z, p, defects);
  const { CslItemSchema, ReferencesFileSchema } = cslSchemas(z, p);
  /** A materials file: any of the three keys. The built-in files each use one. */
  const MaterialsFileSchema = z
    .object({
      $comment: z.union([z.string(), z.array(z.string())]).optional(),
      metals: z.array(MetalEntrySchema, { invalid_type_error: 'expected a list of metal entries' }).optional(),
      supports: z.array(SupportEntrySchema, { invalid_type_error: 'expected a list of support entries' }).optional(),
      references: ReferencesFileSchema.optional(),
    })
    .strict()
    .refine((f) => f.metals !== undefined || f.supports !== undefined || f.references !== undefined, {
      message: 'expected at least one of the keys "metals", "supports", "references"',
    });

  return { propertyValue: p.propertyValue, MetalEntrySchema, ...defects, SupportEntrySchema, CslItemSchema, ReferencesFileSchema, MaterialsFileSchema };
}

export type MaterialsSchemas = ReturnType<typeof makeSchemas>;

// Pure memo of constant schemas; zod is required synchronously (its CommonJS build) so that the
// loader's API stays synchronous.
let schemasMemo: MaterialsSchemas | undefined;

/** The zod schemas of the materials files, built on first use. */
export function materialsSchemas(): MaterialsSchemas {
  if (schemasMemo === undefined) {
    const { z } = createRequire(import.meta.url)('zod') as { z: ZodNamespace };
    schemasMemo = makeSchemas(z);
  }
  return schemasMemo;
}

export type MetalEntry = Z.infer<MaterialsSchemas['MetalEntrySchema']>;
export type SupportEntry = Z.infer<MaterialsSchemas['SupportEntrySchema']>;
export type CslItemEntry = Z.infer<MaterialsSchemas['CslItemSchema']>;
export type MaterialsFile = Z.infer<MaterialsSchemas['MaterialsFileSchema']>;
