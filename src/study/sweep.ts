// Sweep expansion: axes -> points, lazily and in a fixed order.
//
// product: every combination; the first axis varies slowest, the last fastest (nested loops in
//          the order the axes are listed). zip: point i takes the i-th value of every axis.
// linear:  from + (to - from) i / (n - 1), computed as (from (n-1-i) + to i) / (n-1) so that both
//          endpoints are exact.
// log:     10^(log10 from + (log10 to - log10 from) i / (n - 1)), i.e. a constant ratio between
//          neighbours (the usual logarithmic grid); values are rounded to 15 significant digits so
//          that decades come out as 1e17 rather than 1.0000000000000002e17, and the endpoints are
//          exactly from and to.
import type { ContactOptions } from '../inputs/contactInput.js';
import { defaultUnitOf } from '../inputs/units.js';
import { fieldSpec, type Study, type SweepAxis } from './studyFile.js';

export type SweptValue = number | string;

export interface SweepPoint {
  /** position in the sweep, from 0 */
  index: number;
  /** the base options with this point's axis values applied */
  options: ContactOptions;
  /** field -> axis value (numbers in the axis unit, names for categorical axes) */
  swept: Record<string, SweptValue>;
}

/** A point as the options it changes relative to the base (what is sent to workers). */
export interface PointOverrides {
  index: number;
  swept: Record<string, SweptValue>;
  overrides: Partial<ContactOptions>;
}

export function linearSpace(from: number, to: number, points: number): number[] {
  if (points === 1) return [from];
  const last = points - 1;
  return Array.from({ length: points }, (_, i) => (i === 0 ? from : i === last ? to : (from * (last - i) + to * i) / last));
}

export function logSpace(from: number, to: number, points: number): number[] {
  if (points === 1) return [from];
  const a = Math.log10(from);
  const b = Math.log10(to);
  const last = points - 1;
  return Array.from({ length: points }, (_, i) => {
    if (i === 0) return from;
    if (i === last) return to;
    return Number((10 ** ((a * (last - i) + b * i) / last)).toPrecision(15));
  });
}

/** The values of one axis, in order. */
export function axisValues(axis: SweepAxis): SweptValue[] {
  if ('values' in axis) return axis.values;
  if ('linear' in axis) return linearSpace(axis.linear.from, axis.linear.to, axis.linear.points);
  return logSpace(axis.log.from, axis.log.to, axis.log.points);
}

/**
 * The ContactOptions value of an axis value: a bare number when the axis unit is the field's
 * default unit (or there is none), else "value unit" for the unit parser.
 */
export function optionValue(axis: SweepAxis, value: SweptValue): SweptValue {
  if (typeof value === 'string' || axis.unit === undefined || axis.unit === '') return value;
  const spec = fieldSpec(axis.field);
  if (spec?.kind === 'quantity' && defaultUnitOf(spec.quantity) === axis.unit) return value;
  return `${value} ${axis.unit}`;
}

interface PreparedAxis {
  field: string;
  swept: SweptValue[];
  option: SweptValue[];
}

function prepare(axes: readonly SweepAxis[]): PreparedAxis[] {
  return axes.map((axis) => {
    const swept = axisValues(axis);
    return { field: axis.field, swept, option: swept.map((v) => optionValue(axis, v)) };
  });
}

function pointAt(index: number, axes: readonly PreparedAxis[], positions: readonly number[]): PointOverrides {
  const swept: Record<string, SweptValue> = {};
  const overrides: Record<string, SweptValue> = {};
  axes.forEach((axis, k) => {
    swept[axis.field] = axis.swept[positions[k]!]!;
    overrides[axis.field] = axis.option[positions[k]!]!;
  });
  return { index, swept, overrides: overrides as Partial<ContactOptions> };
}

/** Points as overrides of the base options, lazily, in sweep order. */
export function* expandOverrides(sweep: Study['sweep']): Generator<PointOverrides> {
  const axes = prepare(sweep.axes);
  const lengths = axes.map((a) => a.swept.length);
  if (lengths.some((n) => n === 0)) return;
  if (sweep.mode === 'zip') {
    const n = Math.min(...lengths);
    for (let i = 0; i < n; i++) yield pointAt(i, axes, axes.map(() => i));
    return;
  }
  const positions = axes.map(() => 0);
  for (let index = 0; ; index++) {
    yield pointAt(index, axes, positions);
    // odometer: the last axis turns fastest
    let k = axes.length - 1;
    while (k >= 0 && ++positions[k]! === lengths[k]!) {
      positions[k] = 0;
      k--;
    }
    if (k < 0) return;
  }
}

/** The points of a study with their full options, lazily, in sweep order. */
export function* expandSweep(study: Study): Generator<SweepPoint> {
  for (const p of expandOverrides(study.sweep)) {
    yield { index: p.index, options: { ...study.base, ...p.overrides }, swept: p.swept };
  }
}
