// Typed errors for the physics core. A caller (the evaluate endpoint, the
// readings importer) turns them into a plain rejection reason; the physics
// never answers an out-of-range input with an extrapolated number.

export class PhysicsError extends Error {
  // The input's name as the physics function calls it (e.g. "flowTempC"), so
  // that an API layer can report the field path in its own naming.
  readonly field: string | undefined;
  // The reason without the field prefix.
  readonly reason: string;

  constructor(reason: string, field?: string) {
    super(field === undefined ? reason : `${field}: ${reason}`);
    this.name = "PhysicsError";
    this.field = field;
    this.reason = reason;
  }
}

// An input that is not a usable number at all (NaN, Infinity, a negative mass).
export class PhysicsInputError extends PhysicsError {
  constructor(reason: string, field?: string) {
    super(reason, field);
    this.name = "PhysicsInputError";
  }
}

// A number outside the validated range or in the wrong phase; the message
// names the valid range.
export class PhysicsRangeError extends PhysicsError {
  constructor(reason: string, field?: string) {
    super(reason, field);
    this.name = "PhysicsRangeError";
  }
}

export function requireFinite(field: string, value: number): number {
  if (!Number.isFinite(value)) {
    throw new PhysicsInputError(`must be a finite number, got ${value}`, field);
  }
  return value;
}

export function requireNonNegative(field: string, value: number): number {
  requireFinite(field, value);
  if (value < 0) {
    throw new PhysicsInputError(
      `must be zero or positive, got ${value}`,
      field,
    );
  }
  return value;
}

export function requirePositive(field: string, value: number): number {
  requireFinite(field, value);
  if (value <= 0) {
    throw new PhysicsInputError(
      `must be greater than zero, got ${value}`,
      field,
    );
  }
  return value;
}

// A value inside a closed range; the reason names the range with its unit.
export function requireInRange(
  field: string,
  value: number,
  range: { min: number; max: number },
  unit: string,
): number {
  requireFinite(field, value);
  if (value < range.min || value > range.max) {
    throw new PhysicsRangeError(
      `${value} ${unit} is outside ${range.min} ${unit} to ${range.max} ${unit}`,
      field,
    );
  }
  return value;
}
