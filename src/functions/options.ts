/**
 * KNOTWISE.OPTIONS: the settings a method accepts, straight from its
 * declarations, so the sheet itself answers "what can I write in settings?".
 */
import { OptionDeclaration, analysisDefinitions, dashedName, findAnalysis } from '../engine';
import { optionalText } from './cells';
import { guarded } from './excelErrors';

function allowed(d: OptionDeclaration): string {
  switch (d.kind) {
    case 'choice': return (d.choices ?? []).join(', ');
    case 'switch': return 'TRUE or FALSE';
    case 'range': return `low, high${d.min !== undefined ? ` (from ${d.min})` : ''}`;
    default: {
      const lo = d.above !== undefined ? `> ${d.above}` : d.min !== undefined ? `>= ${d.min}` : '';
      const hi = d.max !== undefined ? `<= ${d.max}` : '';
      return `${d.kind === 'integer' ? 'whole number' : 'number'}${lo || hi ? ' ' : ''}${[lo, hi].filter(Boolean).join(' and ')}`;
    }
  }
}

/**
 * The settings a method or changepoint model accepts: name, allowed values, default and what it does. Without a method: every method and model with what it fits.
 * @customfunction OPTIONS
 * @param [method] A method ("spline", "trend") or changepoint model ("level", "volatility", "counts", "distribution", "slope"). Omitted: the list of all of them.
 * @returns A table with a header row.
 */
export function options(method?: string): any[][] {
  return guarded(() => {
    const name = optionalText(method);
    if (name === undefined) {
      return [['method', 'kind', 'what it fits'], ...analysisDefinitions().map((d) => [d.name, d.family === 'changepoints' ? 'changepoint model' : d.family, d.label])];
    }
    const { def } = findAnalysis(name);
    return [['setting', 'allowed', 'default', 'what it does'], ...def.options.map((d) => [dashedName(d.name), allowed(d), d.default === undefined ? '' : Array.isArray(d.default) ? d.default.join(', ') : d.default, d.help])];
  });
}
