import { methodChoices, ruleChoices } from '../../src/taskpane/methodChoices';
import { analysisDefinitions, findAnalysis } from '../../src/engine';

describe('the pane lists from the declarations', () => {
  test('methodChoices lists every registered smoother and changepoint model, with unique values', () => {
    const m = methodChoices();
    expect(new Set(m.map((c) => c.value)).size).toBe(m.length);
    for (const d of analysisDefinitions()) {
      if (d.family === 'decomposition') continue;
      expect(m.some((c) => c.analysis === d.name)).toBe(true);
    }
    expect(m.map((c) => c.value)).toEqual(expect.arrayContaining(['spline', 'trend0', 'trend1', 'trend2', 'trend3', 'auto', 'breaks-level', 'breaks-volatility', 'breaks-counts']));
  });

  test('ruleChoices offers a method only the rules it declares, with df and a fixed penalty where declared', () => {
    for (const c of methodChoices()) {
      const { def } = findAnalysis(c.analysis);
      const declared = def.options.find((o) => o.name === 'rule')?.choices ?? [];
      const offered = ruleChoices(c.analysis).map((r) => r.value).filter((v) => !['auto', 'df', 'value'].includes(v));
      expect(offered).toEqual([...declared]);
    }
    expect(ruleChoices('spline').map((r) => r.value)).toEqual(['auto', 'gcv', 'cv', 'cv-simpler', 'df', 'value']);
    expect(ruleChoices('level').map((r) => r.value)).toEqual(['auto', 'bic', 'mbic', 'value']);
  });
});
