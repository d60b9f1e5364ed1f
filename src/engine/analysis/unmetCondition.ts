import type { OptionDeclaration, OptionValue } from './optionDeclaration';

/** The links of a chain of conditions walked by {@link unmetCondition}, the last one unmet. */
export interface UnmetCondition {
  /** The declarations whose `onlyWith` was checked, from the option asked about up the chain; the last one failed. */
  chain: OptionDeclaration[];
  /** The value the failed condition found (undefined: that option is not set). */
  value: OptionValue | undefined;
}

/**
 * The first unmet condition an option depends on: its own `onlyWith`, then that of the option it
 * names, and so on up the chain. A default is filled in even where its option does not apply (the
 * decomposition's rule defaults to cv also with STL), so a condition on such an option (noise, which
 * depends on the rule) holds only when that option applies too. Shared by the resolver, which refuses
 * a given option with an unmet condition, and the fronts' lists, which leave such options out.
 *
 * @param declarations - an analysis's declared options
 * @param name - the option asked about
 * @param valueOf - the value of an option as given or by default (undefined when unset)
 * @returns undefined when every link holds (or the option has no condition)
 * @example
 * ```ts
 * unmetCondition(decompose.options, 'noise', (k) => ({ method: 'stl', rule: 'cv' })[k]);
 * // { chain: [noise, rule], value: 'stl' }: rule applies only when method is "adaptive"
 * ```
 * Unchecked.
 */
export function unmetCondition(declarations: readonly OptionDeclaration[], name: string, valueOf: (option: string) => OptionValue | undefined): UnmetCondition | undefined {
  const find = (n: string) => declarations.find((d) => d.name === n);
  const chain: OptionDeclaration[] = [];
  // the length bound only guards against a cycle in the declarations
  for (let d = find(name); d?.onlyWith && chain.length <= declarations.length; d = find(d.onlyWith.option)) {
    chain.push(d);
    const v = valueOf(d.onlyWith.option);
    if (v === undefined || !d.onlyWith.values.includes(v)) return { chain, value: v };
  }
  return undefined;
}
