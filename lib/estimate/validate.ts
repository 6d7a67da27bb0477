/**
 * Input checks shared by the estimators. A bad number here is a programming or form error, so
 * it throws a RangeError naming the field instead of returning a silently wrong estimate.
 */

export function requireFinite(name: string, value: number): number {
  if (!Number.isFinite(value)) throw new RangeError(`${name} must be a finite number, got ${value}`);
  return value;
}

export function requireNonNegative(name: string, value: number): number {
  requireFinite(name, value);
  if (value < 0) throw new RangeError(`${name} must not be negative, got ${value}`);
  return value;
}

export function requirePositive(name: string, value: number): number {
  requireFinite(name, value);
  if (value <= 0) throw new RangeError(`${name} must be greater than zero, got ${value}`);
  return value;
}

export function requireFraction(name: string, value: number): number {
  requireFinite(name, value);
  if (value < 0 || value > 1) throw new RangeError(`${name} must lie between 0 and 1, got ${value}`);
  return value;
}

export function requireCount(name: string, value: number): number {
  requireNonNegative(name, value);
  if (!Number.isInteger(value)) throw new RangeError(`${name} must be a whole number, got ${value}`);
  return value;
}
