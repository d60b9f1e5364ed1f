/**
 * Entry of the custom-functions bundle: associates every worksheet function
 * with the id its JSDoc `@customfunction` tag declares (functions.json is
 * generated from those tags at build time), and on a page with Web Workers
 * (Excel's shared runtime of pane and functions, the preview) sends their
 * requests to the page's worker pool, so no calculation blocks Excel and the
 * pane and the functions share one cache and one pool.
 */
import { smooth, penalty, summary, knots, evaluateAt, compare } from './smoothing';
import { breaks, segments, breakScan, breakPath } from './breaks';
import { options } from './options';
import { decompose } from './decompose';

export const worksheetFunctions: Record<string, (...args: any[]) => any> = {
  SMOOTH: smooth,
  PENALTY: penalty,
  SUMMARY: summary,
  KNOTS: knots,
  EVALUATE: evaluateAt,
  BREAKS: breaks,
  SEGMENTS: segments,
  BREAKSCAN: breakScan,
  BREAKPATH: breakPath,
  OPTIONS: options,
  COMPARE: compare,
  DECOMPOSE: decompose,
};

if (typeof CustomFunctions !== 'undefined') {
  for (const [id, fn] of Object.entries(worksheetFunctions)) CustomFunctions.associate(id, fn);
}
