import { InvalidInputError } from '../api/errors';

/**
 * Guards for the engine's numeric arguments. The engine is called from other modules as well as
 * from the calc verbs, so every exported function checks its own input and throws
 * InvalidInputError with the argument's name as the path.
 */
export function requireFinite(path: string, value: number, what = path): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InvalidInputError(`${what} must be a finite number, got ${String(value)}`, [{ path, message: 'expected a finite number' }]);
  }
  return value;
}

export function requirePositive(path: string, value: number, what = path): number {
  requireFinite(path, value, what);
  if (value <= 0) {
    throw new InvalidInputError(`${what} must be greater than zero, got ${value}`, [{ path, message: 'must be greater than zero' }]);
  }
  return value;
}

export function requireNonNegative(path: string, value: number, what = path): number {
  requireFinite(path, value, what);
  if (value < 0) {
    throw new InvalidInputError(`${what} must not be negative, got ${value}`, [{ path, message: 'must not be negative' }]);
  }
  return value;
}

export function requireInRange(path: string, value: number, min: number, max: number, unit: string, what = path): number {
  requireFinite(path, value, what);
  if (value < min || value > max) {
    throw new InvalidInputError(`${what} ${value} ${unit} is outside the supported range ${min}–${max} ${unit}`, [
      { path, message: `must be between ${min} and ${max} ${unit}` },
    ]);
  }
  return value;
}

export function fail(path: string, message: string, summary = message): never {
  throw new InvalidInputError(summary, [{ path, message }]);
}
