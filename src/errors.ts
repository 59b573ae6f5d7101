/**
 * Errors shared by every layer. Expected failures of an estimator are values
 * (`{ ok: false, reason }`), not exceptions; these classes are for the edges.
 */

/** A problem with how the tool was called or with a manifest: exit code 2, nothing measured. */
export class UsageError extends Error {
  override name = 'UsageError';
}

/**
 * Builds every argument error in one shape, e.g.
 * `Expected an integer from 1 to 64 for --jobs but received "0"`.
 */
export function optionError(option: string, expected: string, received: unknown): UsageError {
  return new UsageError(`Expected ${expected} for ${option} but received ${JSON.stringify(String(received))}`);
}
