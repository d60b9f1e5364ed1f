/**
 * The command line reads CSV fields by the rule the worksheet follows for cells
 * (README, "Numbers, text and blanks") and names what it leaves out alike.
 */
import { parseCsv, fieldToCell } from '../../src/cli/csv';
import { runCli } from '../../src/cli/main';
import { smooth } from '../../src/functions/smoothing';
import { clearComputeCache } from '../../src/functions/compute';
import { memoryIO } from './fronts';

const Y = [12, 15, 11, 18, 16, 21, 19, 24, 22, 27, 25, 30];
const csvOf = (cells: string[]) => ['y', ...cells].join('\n') + '\n';
const warningsOf = (json: string) => (JSON.parse(json).warnings as { code: string; message: string }[]).map((w) => w.message).join(' | ');

describe('one rule for numbers, text and blanks on every front', () => {
  test('a CSV field is a number only when it is a plain decimal numeral; numbers with anything around them are text', () => {
    expect(['12', '-3.5', '1e1', '.5', '+2'].map(fieldToCell)).toEqual([12, -3.5, 10, 0.5, 2]);
    expect([' 12 ', '12 ', '1,234', '12%', '$5'].map(fieldToCell)).toEqual([' 12 ', '12 ', '1,234', '12%', '$5']);
    expect(['', '   '].map(fieldToCell)).toEqual([null, null]);
    expect(parseCsv('a,b\n"12"," 12 "\n').rows).toEqual([[12, ' 12 ']]);
  });

  test('a CSV field holding an Excel error, TRUE/FALSE or NaN/Infinity becomes that kind of cell', () => {
    expect(['#N/A', '#DIV/0!', '#value!'].map(fieldToCell)).toEqual([{ error: '#N/A' }, { error: '#DIV/0!' }, { error: '#VALUE!' }]);
    expect(['TRUE', 'false'].map(fieldToCell)).toEqual([true, false]);
    expect(['NaN', 'Infinity', '-Infinity', '-inf'].map(fieldToCell)).toEqual([NaN, Infinity, -Infinity, -Infinity]);
  });

  test('the command line leaves out " 12 " as the worksheet does, and both give the same fit', async () => {
    const cells: unknown[] = Y.map((v, i) => (i === 4 ? ' 16 ' : v));
    const io = memoryIO({ 'd.csv': csvOf(cells.map(String)) });
    expect(runCli(['fit', 'd.csv', '--y', 'y', '--df', '4', '--json'], io.host)).toBe(0);
    const o = JSON.parse(io.out.join(''));
    expect(o.fitted[4]).toBeNull();
    expect(warningsOf(io.out.join(''))).toMatch(/1 a number stored as text .*\(row 5\)/);
    clearComputeCache();
    const sheet = await smooth(cells.map((v) => [v]), undefined, 'spline', 'df=4');
    expect(sheet.map((r) => (r[0] === '' ? null : r[0]))).toEqual(o.fitted);
  });

  test('the command line names error values, TRUE/FALSE and NaN as the worksheet does, not as text', () => {
    const cells = Y.map(String);
    cells[2] = '#N/A'; cells[5] = 'TRUE'; cells[8] = 'NaN';
    const io = memoryIO({ 'd.csv': csvOf(cells) });
    expect(runCli(['fit', 'd.csv', '--y', 'y', '--json'], io.host)).toBe(0);
    const text = warningsOf(io.out.join(''));
    expect(text).toMatch(/1 an error value \(row 3\)/);
    expect(text).toMatch(/1 TRUE\/FALSE \(row 6\)/);
    expect(text).toMatch(/1 not finite \(row 9\)/);
    expect(text).not.toMatch(/\btext\b/);
  });
});

describe('rows keep their numbers', () => {
  test('an empty line inside a one-column file is a blank row, so later rows are not shifted', () => {
    expect(parseCsv('y\n1\n\n3\n4\n\n\n').rows).toEqual([[1], [null], [3], [4]]);
    const io = memoryIO({ 'd.csv': 'y\n12\n15\n\n18\n16\n21\n19\n' });
    expect(runCli(['fit', 'd.csv', '--df', '3', '--json'], io.host)).toBe(0);
    const o = JSON.parse(io.out.join(''));
    expect(o.fitted).toHaveLength(7);
    expect(o.fitted[2]).toBeNull();
    expect(o.fitted[3]).not.toBeNull();
  });
});
