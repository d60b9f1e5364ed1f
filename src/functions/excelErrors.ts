/**
 * Engine errors to Excel errors. Every user-fixable problem becomes #VALUE!
 * with the engine's message, since #VALUE! (and #N/A) are the codes that carry
 * a message in Excel's error indicator; anything unexpected becomes #VALUE!
 * with a short note, never a crash of the calculation.
 */
import { isKnotwiseError } from '../engine';

/** Builds the Excel error for a caught exception. */
export function toExcelError(e: unknown): Error {
  const message = isKnotwiseError(e) ? e.message : `unexpected failure: ${e instanceof Error ? e.message : String(e)}`;
  if (typeof CustomFunctions !== 'undefined' && CustomFunctions.Error) {
    return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, message) as unknown as Error;
  }
  const err = new Error(message);
  (err as Error & { code: string }).code = '#VALUE!';
  return err;
}

/** Runs a worksheet function body, turning any exception into an Excel error. */
export function guarded<T>(body: () => T): T {
  try {
    return body();
  } catch (e) {
    throw toExcelError(e);
  }
}

/** Runs an asynchronous worksheet function body; any failure becomes an Excel error. */
export async function guardedAsync<T>(body: () => Promise<T>): Promise<T> {
  try {
    return await body();
  } catch (e) {
    throw toExcelError(e);
  }
}
