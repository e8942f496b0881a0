import type { ParseResult, RowError } from "./types";

export const DEFAULT_MAX_ERRORS = 1000;

/**
 * Collects refusals but keeps only the first `limit`: a file read with the
 * wrong mapping can refuse every one of its 876,000 values, and a list that
 * long helps nobody while costing the browser its memory.
 */
export class ErrorList {
  readonly errors: RowError[] = [];
  count = 0;

  constructor(private readonly limit: number = DEFAULT_MAX_ERRORS) {}

  add(row: number, column: string, message: string): void {
    this.count++;
    if (this.errors.length < this.limit) {
      this.errors.push({ row, column, message });
    }
  }
}

/** A parse's result before its first row: nothing read, its refusals in `errors`. */
export function emptyResult(errors: ErrorList): ParseResult {
  return {
    readings: [],
    readingRows: [],
    errors: errors.errors,
    errorCount: 0,
    notes: [],
  };
}
