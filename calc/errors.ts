/** One problem with one input, named by its field. */
export interface FieldError {
  field: string;
  message: string;
}

/** The typed error result returned by validateSpec, computeSpec and the solvers. */
export interface ErrorResult {
  ok: false;
  errors: FieldError[];
}

/**
 * Thrown by the single-value functions (sweptVolumeCc, pistonPositionMm, …) when an
 * argument is outside their domain. computeSpec, validateSpec and the solvers never
 * throw: they return an ErrorResult instead.
 */
export class CalcInputError extends RangeError {
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.name = "CalcInputError";
    this.field = field;
  }
}

export function isFiniteNumber(x: unknown): x is number {
  return typeof x === "number" && Number.isFinite(x);
}

/** Throws CalcInputError unless x is a finite number greater than zero. */
export function requirePositive(x: number, field: string): void {
  if (!(typeof x === "number" && Number.isFinite(x) && x > 0)) {
    throw new CalcInputError(field, "must be a finite number greater than zero");
  }
}

/** Throws CalcInputError unless x is a finite number. */
export function requireFinite(x: number, field: string): void {
  if (!(typeof x === "number" && Number.isFinite(x))) {
    throw new CalcInputError(field, "must be a finite number");
  }
}
