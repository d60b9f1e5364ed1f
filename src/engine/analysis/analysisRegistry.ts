/**
 * The registry of analyses. Fronts list it to build their controls and help;
 * {@link runAnalysis} looks requests up in it.
 */
import { KnotwiseError } from '../errors';
import type { AnalysisDefinition, AnalysisFamily } from './analysisDefinition';

const analyses = new Map<string, AnalysisDefinition>();
const oldNames = new Map<string, string>();

/** Registers an analysis under its name and old names (replacing any earlier one). */
export function registerAnalysis(def: AnalysisDefinition): void {
  analyses.set(def.name, def);
  for (const o of def.oldNames ?? []) oldNames.set(o, def.name);
}

/** An analysis and whether it was found under an old name. */
export function findAnalysis(name: string, family?: AnalysisFamily): { def: AnalysisDefinition; renamedFrom?: string } {
  const key = typeof name === 'string' ? name.trim().toLowerCase() : '';
  let def = analyses.get(key);
  let renamedFrom: string | undefined;
  if (!def && oldNames.has(key)) { def = analyses.get(oldNames.get(key)!); renamedFrom = key; }
  if (!def || (family && def.family !== family)) {
    const names = analysisDefinitions(family).map((d) => d.name);
    throw new KnotwiseError('unknown-method', `unknown ${family === 'changepoints' ? 'changepoint model' : 'method'} "${String(name)}"; use one of: ${names.join(', ')}.`);
  }
  return { def, renamedFrom };
}

/** Registered analyses, in registration order; of one family when given. */
export function analysisDefinitions(family?: AnalysisFamily): AnalysisDefinition[] {
  return [...analyses.values()].filter((d) => !family || d.family === family);
}
