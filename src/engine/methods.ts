/**
 * Registers the built-in methods. Importing this module (the engine index does)
 * makes them available to {@link fit} and {@link getMethod}.
 */
import { registerMethod } from './registry';
import { splineMethod } from './smoothers/spline';
import { trendMethod } from './smoothers/trend';

registerMethod(splineMethod);
registerMethod(trendMethod);
