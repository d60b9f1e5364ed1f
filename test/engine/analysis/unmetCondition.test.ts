/**
 * The chain of conditions between options, on the decomposition's declarations (noise depends on
 * rule, rule on method) and on invented ones (a cycle).
 */
import { unmetCondition, findAnalysis } from '../../../src/engine';
import type { OptionDeclaration, OptionValue } from '../../../src/engine';

const decl = findAnalysis('decompose').def.options;
const valuesOf = (v: Record<string, OptionValue>) => (k: string) => v[k];

describe('unmetCondition', () => {
  test('unmetCondition walks up the chain: noise holds under the adaptive method with a cross-validating rule, fails at rule with stl and at noise with bic', () => {
    expect(unmetCondition(decl, 'noise', valuesOf({ method: 'adaptive', rule: 'cv' }))).toBeUndefined();
    const stl = unmetCondition(decl, 'noise', valuesOf({ method: 'stl', rule: 'cv' }))!;
    expect(stl.chain.map((d) => d.name)).toEqual(['noise', 'rule']);
    expect(stl.value).toBe('stl');
    const bic = unmetCondition(decl, 'noise', valuesOf({ method: 'adaptive', rule: 'bic' }))!;
    expect(bic.chain.map((d) => d.name)).toEqual(['noise']);
    expect(bic.value).toBe('bic');
    // unset counts as unmet
    expect(unmetCondition(decl, 'noise', valuesOf({ method: 'adaptive' }))!.value).toBeUndefined();
  });

  test('unmetCondition: an option without a condition always applies, and a cycle in the declarations ends', () => {
    expect(unmetCondition(decl, 'method', valuesOf({}))).toBeUndefined();
    const cyc: OptionDeclaration[] = [
      { name: 'a', kind: 'choice', choices: ['x'], onlyWith: { option: 'b', values: ['x'] }, help: '' },
      { name: 'b', kind: 'choice', choices: ['x'], onlyWith: { option: 'a', values: ['x'] }, help: '' },
    ];
    expect(unmetCondition(cyc, 'a', valuesOf({ a: 'x', b: 'x' }))).toBeUndefined();
  });
});
