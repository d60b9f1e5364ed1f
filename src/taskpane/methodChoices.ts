/**
 * The pane's method and penalty lists, generated from the engine's declared
 * analyses: every smoother variant (the ones the automatic choice compares,
 * plus methods without variants), the automatic choice, and every changepoint
 * model, each labelled in the words its declaration gives; and for each method
 * only the penalty rules it declares, so no method can be paired with a rule
 * it does not accept. Pure: no DOM.
 */
import { DEFAULT_SMOOTHER, analysisDefinitions, findAnalysis, RULE_HELP, unmetCondition } from '../engine';
import type { AnalysisDefinition, OptionValue } from '../engine';

/** One entry of the method list. */
export interface MethodChoice {
  /** Stable value of the list entry (e.g. 'trend1', 'spline', 'breaks-level'). */
  value: string;
  /** What the analyst reads. */
  label: string;
  kind: 'smooth' | 'breaks' | 'decompose';
  /** The registered analysis and the options the entry fixes (e.g. order 1). */
  analysis: string;
  options: Record<string, OptionValue>;
}

/** One entry of the penalty list: a declared rule, a df target, a fixed penalty, or the method's default. */
export interface RuleChoice {
  value: string;
  label: string;
}

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

function variantsOf(def: AnalysisDefinition): MethodChoice[] {
  if (def.family === 'changepoints') return [{ value: `breaks-${def.name}`, label: `Changepoints: ${def.label.charAt(0).toLowerCase()}${def.label.slice(1)}`, kind: 'breaks', analysis: def.name, options: {} }];
  if (def.family === 'decomposition') {
    // one entry per declared way of taking the series apart (its 'method' choice), worded by the declaration
    const how = def.options.find((o) => o.name === 'method');
    const ways = how?.choices ?? [];
    if (!ways.length) return [{ value: def.name, label: def.label, kind: 'decompose', analysis: def.name, options: {} }];
    return ways.map((w) => ({
      value: `${def.name}-${w}`, kind: 'decompose' as const, analysis: def.name, options: { method: w },
      label: `Decomposition: ${(how?.choiceHelp?.[w] ?? w).replace(/\s*\(default\)\s*$/, '')}`,
    }));
  }
  if (def.family !== 'smoother') return [];
  const vs = def.autoVariants ?? [];
  if (vs.length === 0) return [{ value: def.name, label: def.label, kind: 'smooth', analysis: def.name, options: {} }];
  return vs.map((v) => ({ value: def.name + Object.values(v.options).join(''), label: cap(v.label), kind: 'smooth' as const, analysis: def.name, options: { ...v.options } }));
}

/**
 * The method list: the default smoother first ({@link DEFAULT_SMOOTHER}, the automatic choice), then the
 * rest in registration order (smoothers, changepoint models, decompositions).
 */
export function methodChoices(): MethodChoice[] {
  const all = analysisDefinitions().flatMap(variantsOf);
  return [...all.filter((m) => m.value === DEFAULT_SMOOTHER), ...all.filter((m) => m.value !== DEFAULT_SMOOTHER)];
}

/**
 * The options of `def` that apply when the entry fixes `fixed`: those whose chain of conditions holds
 * with the fixed values and the defaults ({@link unmetCondition}, the resolver's own rule).
 */
function applicable(def: AnalysisDefinition, fixed: Record<string, OptionValue>): AnalysisDefinition['options'] {
  const valueOf = (k: string) => fixed[k] ?? def.options.find((p) => p.name === k)?.default;
  return def.options.filter((o) => !unmetCondition(def.options, o.name, valueOf));
}

/** Whether `analysis` declares `option` and it applies with the options `fixed` (its `onlyWith` condition met). */
export function optionApplies(analysis: string, option: string, fixed: Record<string, OptionValue> = {}): boolean {
  return applicable(findAnalysis(analysis).def, fixed).some((o) => o.name === option);
}

/**
 * The penalty list of one method: its default first, then the rules it declares, a df target and a fixed
 * penalty when declared; `fixed` are the options the list entry fixes (a decomposition's method), so a rule
 * that does not apply with them (STL has no trend penalty) is not offered.
 */
export function ruleChoices(analysis: string, fixed: Record<string, OptionValue> = {}): RuleChoice[] {
  const { def } = findAnalysis(analysis);
  const opts = applicable(def, fixed);
  const rule = opts.find((o) => o.name === 'rule');
  const out: RuleChoice[] = [{ value: 'auto', label: `Automatic (${rule?.default !== undefined ? String(rule.default) : 'the method\'s default'})` }];
  for (const c of rule?.choices ?? []) out.push({ value: c, label: cap(rule?.choiceHelp?.[c] ?? RULE_HELP[c] ?? c).replace(/:.*$/, '') });
  if (opts.some((o) => o.name === 'df')) out.push({ value: 'df', label: 'Target degrees of freedom' });
  if (opts.some((o) => o.name === 'penalty')) out.push({ value: 'value', label: 'Fixed penalty' });
  return out;
}

/** The options a penalty choice adds to a request. */
export function ruleOptions(rule: string, value?: number): Record<string, unknown> {
  if (rule === 'auto') return {};
  if (rule === 'df') return { df: value };
  if (rule === 'value') return { penalty: value };
  return { rule };
}

/** One sentence on what the method does when the penalty is left to it. */
export function defaultRuleNote(analysis: string, fixed: Record<string, OptionValue> = {}): string {
  const { def } = findAnalysis(analysis);
  const rule = applicable(def, fixed).find((o) => o.name === 'rule');
  if (!rule || rule.default === undefined) return 'Automatic: the method sets its own smoothing.';
  const d = String(rule.default);
  return `Automatic: ${d} - ${rule.choiceHelp?.[d] ?? RULE_HELP[d] ?? d}.`;
}

/**
 * The values of a method's declared choice option (e.g. a decomposition's 'season'), each labelled by its
 * declared help, the default first; empty when the method does not declare it.
 */
export function optionChoices(analysis: string, option: string): RuleChoice[] {
  const { def } = findAnalysis(analysis);
  const o = def.options.find((p) => p.name === option);
  if (!o || o.kind !== 'choice' || !o.choices) return [];
  const words = (c: string) => cap((o.choiceHelp?.[c] ?? c).replace(/\s*\(default\)\s*$/, ''));
  const first = o.choices.filter((c) => c === o.default);
  return [...first, ...o.choices.filter((c) => c !== o.default)].map((c) => ({ value: String(c), label: words(String(c)) }));
}
