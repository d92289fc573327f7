/**
 * The only error the domain engine throws for bad input. `field` names the offending input
 * using the same dotted path as the JSON request contracts (e.g. "band.lowKHz"), so a route
 * can turn it into a field-level 400 without guessing.
 */
export class EngineError extends Error {
  readonly code: string;
  readonly field?: string;

  constructor(code: string, message: string, field?: string) {
    super(message);
    this.name = "EngineError";
    this.code = code;
    if (field !== undefined) this.field = field;
  }
}

export function isEngineError(value: unknown): value is EngineError {
  return value instanceof EngineError;
}

/** Guards every numeric input so that no computation can quietly produce NaN or Infinity. */
export function requireFinite(value: number, field: string, label = field): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new EngineError("not-finite", `${label} must be a finite number.`, field);
  }
  return value;
}

export function requirePositive(value: number, field: string, label = field): number {
  requireFinite(value, field, label);
  if (value <= 0) throw new EngineError("not-positive", `${label} must be greater than zero.`, field);
  return value;
}
