/**
 * Every catalogue case through every worksheet function and every command
 * (fit with each smoothing method, breaks with each changepoint model): the
 * outcome must be the one the catalogue records, and never a crash.
 */
import { CASES, Case, Outcome, TARGETS, Target, expected } from './catalogue';
import { Run, runCommand, runSheet } from './fronts';
import { count, newTally, saveTally } from './tally';


function describeRun(r: Run): string {
  return `${r.call}: ${r.kind}${r.error ? ` "${r.error}"` : ` [${r.warnings.join(', ')}]`}${r.problems.length ? ` problems: ${r.problems.join('; ')}` : ''}`;
}

function check(r: Run, want: Outcome): void {
  expect({ run: describeRun(r), problems: r.problems }).toEqual({ run: describeRun(r), problems: [] });
  if (want.result) {
    expect({ run: describeRun(r), kind: r.kind }).toEqual({ run: describeRun(r), kind: 'result' });
    for (const code of want.warnings) expect({ run: describeRun(r), has: r.warnings.includes(code), code }).toEqual({ run: describeRun(r), has: true, code });
    if (want.message) expect(r.warningText).toMatch(want.message);
    if (want.notSaying) expect(r.warningText).not.toMatch(want.notSaying);
    for (const code of want.absent ?? []) expect({ run: describeRun(r), has: r.warnings.includes(code), code }).toEqual({ run: describeRun(r), has: false, code });
  } else {
    expect({ run: describeRun(r), kind: r.kind }).toEqual({ run: describeRun(r), kind: 'error' });
    expect(r.error).toMatch(want.error);
  }
}

/**
 * The catalogue's tests for some targets. The automatic choice (which
 * cross-validates every smoother) is not rerun here: its reruns are checked
 * by the property tests on smaller inputs.
 */
export function catalogueSuite(name: string, targets: readonly Target[]): void {
const tally = newTally();
afterAll(() => saveTally(name, tally));
const rows: [string, Case, Target][] = [];
for (const c of CASES) for (const t of c.targets ?? TARGETS) if (targets.includes(t)) rows.push([`${c.name} / ${t}`, c, t]);

describe(`the catalogue of hostile inputs (${name})`, () => {
  describe.each(rows)('%s', (_label, c, t) => {
    const known = c.knownFault ? test.failing : test;
    known('worksheet functions', async () => {
      const runs = await runSheet(c, t, t !== 'auto');
      runs.forEach((r) => count(tally, r));
      for (const r of runs) check(r, expected(c, 'sheet', t, r.call));
    });
    if (c.cli !== false) {
      known('command line', () => {
        const r = runCommand(c, t, t !== 'auto');
        count(tally, r);
        check(r, expected(c, 'cli', t));
      });
    }
  });
});
}
