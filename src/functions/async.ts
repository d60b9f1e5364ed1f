/**
 * Asynchronous, cancelable worksheet functions: the analysis runs in the
 * page's worker pool (shared with the pane), the function returns a Promise
 * (Excel shows #BUSY! meanwhile) and Excel's cancellation, when the user edits
 * an input or recalculates, stops the job.
 *
 * A worksheet function takes a last parameter
 * `invocation?: CustomFunctions.CancelableInvocation` (which marks it
 * cancelable in functions.json) and calls:
 *
 * ```ts
 * export async function smooth(y: any[][], ..., invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
 *   return guardedAsync(async () => shape(await cancelableCompute(invocation, request)));
 * }
 * ```
 */
import { compute } from '../runtime/browser/pageRuntime';
import type { AnalysisRequest, AnalysisResult } from '../runtime/engineEntry';
import { toExcelError } from './excelErrors';

/** What the functions need of Excel's invocation object. */
export interface CancelableCall {
  onCanceled?: () => void;
}

/**
 * Runs `request` off the page's thread; Excel's `onCanceled` aborts it. Equal
 * requests from several cells share one job and one cached result.
 */
export function cancelableCompute(invocation: CancelableCall | undefined, request: AnalysisRequest): Promise<AnalysisResult> {
  const controller = new AbortController();
  if (invocation) invocation.onCanceled = () => controller.abort();
  return compute(request, { signal: controller.signal });
}

/** Runs an asynchronous function body, turning any failure into an Excel error. */
export async function guardedAsync<T>(body: () => Promise<T>): Promise<T> {
  try {
    return await body();
  } catch (e) {
    throw toExcelError(e);
  }
}
