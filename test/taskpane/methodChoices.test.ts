import { methodChoices, optionApplies, ruleChoices } from '../../src/taskpane/methodChoices';
import { DEFAULT_SMOOTHER, analysisDefinitions, findAnalysis } from '../../src/engine';

describe('the pane lists from the declarations', () => {
  test('methodChoices lists every registered smoother, changepoint model and decomposition, with unique values', () => {
    const m = methodChoices();
    expect(new Set(m.map((c) => c.value)).size).toBe(m.length);
    for (const d of analysisDefinitions()) expect(m.some((c) => c.analysis === d.name)).toBe(true);
    // one decomposition entry per declared way of taking the series apart
    const ways = findAnalysis('decompose').def.options.find((o) => o.name === 'method')!.choices!;
    expect(m.filter((c) => c.kind === 'decompose').map((c) => c.options.method)).toEqual([...ways]);
    expect(m.map((c) => c.value)).toEqual(expect.arrayContaining(['spline', 'trend0', 'trend1', 'trend2', 'trend3', 'auto', 'breaks-level', 'breaks-volatility', 'breaks-counts']));
  });

  test('the default smoother (the automatic choice) comes first, the rest in registration order', () => {
    const m = methodChoices();
    expect(m[0].value).toBe(DEFAULT_SMOOTHER);
    expect(m[0].analysis).toBe('auto');
    const rest = analysisDefinitions().filter((d) => d.name !== DEFAULT_SMOOTHER).map((d) => d.name);
    expect([...new Set(m.slice(1).map((c) => c.analysis))]).toEqual(rest);
  });

  test('ruleChoices offers a method only the rules it declares, with df and a fixed penalty where declared', () => {
    for (const c of methodChoices()) {
      const { def } = findAnalysis(c.analysis);
      const rule = def.options.find((o) => o.name === 'rule');
      // a rule declared only with other values of an option the entry fixes (STL has no trend penalty) is not offered
      const applies = !rule?.onlyWith || rule.onlyWith.values.includes(c.options[rule.onlyWith.option] ?? def.options.find((o) => o.name === rule.onlyWith!.option)!.default!);
      const declared = applies ? rule?.choices ?? [] : [];
      const offered = ruleChoices(c.analysis, c.options).map((r) => r.value).filter((v) => !['auto', 'df', 'value'].includes(v));
      expect(offered).toEqual([...declared]);
    }
    expect(ruleChoices('spline').map((r) => r.value)).toEqual(['auto', 'gcv', 'cv', 'cv-simpler', 'df', 'value']);
    expect(ruleChoices('level').map((r) => r.value)).toEqual(['auto', 'bic', 'mbic', 'value']);
  });

  test('optionApplies follows a chain of conditions: the decomposition\'s noise setting depends on its rule, which applies only to the adaptive method', () => {
    expect(optionApplies('decompose', 'noise', { method: 'adaptive' })).toBe(true);
    expect(optionApplies('decompose', 'noise', { method: 'adaptive', rule: 'cv-simpler' })).toBe(true);
    expect(optionApplies('decompose', 'noise', { method: 'adaptive', rule: 'bic' })).toBe(false);
    // STL: rule does not apply, so its default "cv" must not make noise look applicable
    expect(optionApplies('decompose', 'noise', { method: 'stl' })).toBe(false);
    expect(optionApplies('trend', 'noise', { order: 1 })).toBe(true);
  });
});
