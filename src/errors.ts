/** Bad input from a user: CLI option, study file, materials file, CSV. The CLI maps it to exit code 2. */
export class InputError extends Error {
  readonly field: string;
  readonly allowed: string | undefined;
  constructor(field: string, message: string, allowed?: string) {
    super(allowed ? `${field}: ${message} (allowed: ${allowed})` : `${field}: ${message}`);
    this.name = 'InputError';
    this.field = field;
    this.allowed = allowed;
  }
}

/** The numerical solver did not reach a solution; the reason says why. Exit code 1 in the CLI. */
export class ConvergenceError extends Error {
  readonly reason: string;
  readonly iterations: number;
  constructor(reason: string, iterations: number) {
    super(`solver did not converge: ${reason} (after ${iterations} iterations)`);
    this.name = 'ConvergenceError';
    this.reason = reason;
    this.iterations = iterations;
  }
}

/** Throw InputError unless value is finite and inside [min, max]. */
export function requireInRange(field: string, value: number, min: number, max: number, unit: string): number {
  if (!Number.isFinite(value) || value < min || value > max) {
    const suffix = unit === '' ? '' : ` ${unit}`;
    throw new InputError(field, `value ${formatValue(value)}${suffix} is out of range`, `${min} to ${max}${suffix}`);
  }
  return value;
}

function formatValue(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

/** A failure a batch (screen row, sweep point, uncertainty sample) records and goes on from; anything else is a bug. */
export function isModelFailure(error: unknown): error is InputError | ConvergenceError {
  return error instanceof InputError || error instanceof ConvergenceError;
}
