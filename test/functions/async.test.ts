/**
 * The asynchronous worksheet functions: each returns a Promise, equal calls
 * share one computation, Excel's cancellation reaches the job, and engine
 * errors still arrive as #VALUE! with the engine's message. (Node has no Web
 * Workers, so here the page runtime runs jobs on this thread one task later;
 * the browser test checks the worker path.)
 */
import { smooth, penalty, summary, knots } from '../../src/functions/smoothing';
import { breaks, segments } from '../../src/functions/breaks';
import { cancelableCompute } from '../../src/functions/async';
import { clearFitCache } from '../../src/functions/fitArgs';
import { pageRuntime } from '../../src/runtime/browser/pageRuntime';
import { breaksFromCells } from '../../src/engine';

const col = (a: unknown[]) => a.map((v) => [v]);
// Invented weekly levels with a step at row 13.
const steps = [10, 11, 9, 10, 12, 10, 11, 9, 10, 11, 10, 12, 20, 21, 19, 20, 22, 21, 20, 19, 21, 20];

test('the functions return Promises', () => {
  const p = smooth(col(steps), undefined, 'spline', undefined, undefined, undefined, 4);
  expect(p).toBeInstanceOf(Promise);
  return p;
});

test('ten functions called together on one range and options compute once', async () => {
  clearFitCache();
  const rt = pageRuntime();
  const before = rt.client.submitted;
  const calls = [
    ...Array.from({ length: 7 }, () => smooth(col(steps), undefined, 'trend', 0)),
    penalty(col(steps), undefined, 'trend', 0), summary(col(steps), undefined, 'trend', 0), knots(col(steps), undefined, 'trend', 0),
  ];
  const out = await Promise.all(calls);
  expect(rt.client.submitted - before).toBe(1);
  expect(out[0]).toEqual(out[6]);
});

test('BREAKS and SEGMENTS share one segmentation and match the engine', async () => {
  const rt = pageRuntime();
  const before = rt.client.submitted;
  const [table, fitted] = await Promise.all([breaks(col(steps)), segments(col(steps))]);
  expect(rt.client.submitted - before).toBe(1);
  const ref = breaksFromCells(steps, null, null, { model: 'mean' });
  expect(table.slice(1).map((r) => r[1])).toEqual(ref.result.breaks.map((b) => b.row + 1));
  expect(fitted.map((r) => r[0])).toEqual(Array.from(ref.result.fitted));
});

test("Excel's cancellation rejects the call as cancelled; the next equal call still gets its values", async () => {
  clearFitCache();
  const invocation: { onCanceled?: () => void } = {};
  const y = steps.map((v, i) => v + i / 100);
  const p = smooth(col(y), undefined, 'spline', undefined, undefined, undefined, 5, undefined, undefined, undefined, undefined, invocation as CustomFunctions.CancelableInvocation);
  expect(typeof invocation.onCanceled).toBe('function');
  invocation.onCanceled!();
  await expect(p).rejects.toThrow(/the computation was cancelled/);
  await new Promise((r) => setTimeout(r, 5));
  expect(pageRuntime().client.pending).toBe(0);
  const again = await smooth(col(y), undefined, 'spline', undefined, undefined, undefined, 5);
  expect(again).toHaveLength(y.length);
  expect(typeof again[0][0]).toBe('number');
});

test('cancelableCompute hands the request to the shared runtime and returns the analysis result', async () => {
  const inv: { onCanceled?: () => void } = {};
  const out = await cancelableCompute(inv, { analysis: 'breaks', y: steps, options: { model: 'mean' } });
  expect(out.kind).toBe('breaks');
  expect(typeof inv.onCanceled).toBe('function');
});

test('an engine error arrives as #VALUE! with the engine message', async () => {
  const err: any = await breaks(col(steps), undefined, 'wobbly').catch((e) => e);
  expect(err.code).toBe('#VALUE!');
  expect(err.message).toMatch(/wobbly/);
});
