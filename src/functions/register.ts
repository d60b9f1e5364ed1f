/**
 * Entry of the custom-functions bundle: associates every worksheet function
 * with the id its JSDoc `@customfunction` tag declares (functions.json is
 * generated from those tags at build time).
 */
import { smooth, penalty, summary, knots, evaluateAt } from './smoothing';
import { breaks, segments, breakScan, breakPath } from './breaks';
import { options } from './options';

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
};

if (typeof CustomFunctions !== 'undefined') {
  for (const [id, fn] of Object.entries(worksheetFunctions)) CustomFunctions.associate(id, fn);
}
