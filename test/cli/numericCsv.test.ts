/**
 * The fast numeric CSV path must read exactly what the general reader reads
 * (parseCsv, whose rule takes only plain numerals as numbers), and hand every
 * other file back to it: padded numbers (text by that rule) and empty lines
 * inside the data (rows of blanks) included.
 */
import fc from 'fast-check';
import { parseCsv, parseNumericCsv } from '../../src/cli/csv';
import { runCli } from '../../src/cli/main';

const sameAsGeneral = (text: string) => {
  const fast = parseNumericCsv(text);
  const slow = parseCsv(text);
  expect(fast).not.toBeNull();
  expect(fast!.header).toEqual(slow.header);
  expect(fast!.columns.every((c) => c.length === slow.rows.length)).toBe(true);
  fast!.columns.forEach((c, j) => c.forEach((v, i) => expect(Object.is(v, slow.rows[i][j])).toBe(true)));
};

describe('parseNumericCsv', () => {
  test('numbers written every plain-decimal way read as Number() reads them', () => {
    sameAsGeneral('a,b,c\n1,-2.5,3e4\n+.5,5.,1E-7\n7,8,0.1\r\n-0,12345678901234567890,1.7976931348623157e308\n4.9e-324,0.30000000000000004,123456.789e-30\n');
  });

  test('random decimal fields of every length and exponent agree with the general reader', () => {
    const digits = fc.stringMatching(/^[0-9]{1,22}$/);
    const field = fc.tuple(fc.constantFrom('', '-', '+'), digits, fc.option(fc.stringMatching(/^[0-9]{0,20}$/)), fc.option(fc.integer({ min: -340, max: 340 })), fc.constantFrom('', ' '))
      .map(([s, i, f, e, pad]) => `${pad}${s}${i}${f === null ? '' : '.' + f}${e === null ? '' : 'e' + e}${pad}`);
    fc.assert(fc.property(fc.array(fc.array(field, { minLength: 3, maxLength: 3 }), { minLength: 1, maxLength: 20 }), fc.constantFrom('\n', '\r\n'), (rows, eol) => {
      const text = ['x,y,z', ...rows.map((r) => r.join(','))].join(eol) + eol;
      // a padded field is a number stored as text: the general reader's business
      if (rows.some((r) => r.some((f) => f !== f.trim()))) expect(parseNumericCsv(text)).toBeNull();
      else sameAsGeneral(text);
    }), { numRuns: 300 });
  });

  test('trailing empty lines end the data and a missing final line end is fine; an empty line inside the data goes to the general reader', () => {
    sameAsGeneral('\ufeffx,y\n1,2\n3,4');
    sameAsGeneral('x,y\n1,2\n3,4\n\n\n');
    expect(parseNumericCsv('x,y\n1,2\n\n3,4')).toBeNull();
    expect(parseCsv('x,y\n1,2\n\n3,4').rows).toEqual([[1, 2], [null], [3, 4]]);
  });

  test('any other file goes back to the general reader', () => {
    for (const text of ['x,y\n 1,2\n', 'x,y\n1,2\t\n', 'x,y\n1,\n', 'x,y\n1,a\n', 'x,y\n1,"2"\n', 'x,y\n1\n', 'x,y\n1,2,3\n', 'x,y\n.,1\n', 'x,y\n1e,2\n', 'x,y\nNaN,1\n', 'x,y\n1,2 3\n', '"x",y\n1,2\n', '']) {
      expect(parseNumericCsv(text)).toBeNull();
    }
  });
});

describe('knotwise fit on an all-numeric file (the fast path)', () => {
  test('gives the same JSON as the same file read by the general reader', () => {
    // An invented all-numeric file; a trailing text cell in one copy sends that copy to the general reader.
    const rows = Array.from({ length: 60 }, (_, i) => `${i + 1},${(Math.sin(i / 6) * 5 + (i % 7) / 3).toFixed(4)}`);
    const fast = 'day,level\n' + rows.join('\n') + '\n';
    const general = 'day,level,note\n' + rows.map((r, i) => `${r},${i === 0 ? 'start' : ''}`).join('\n') + '\n';
    expect(parseNumericCsv(fast)).not.toBeNull();
    expect(parseNumericCsv(general)).toBeNull();
    const run = (text: string) => {
      const out: string[] = [], err: string[] = [];
      const code = runCli(['fit', 'f.csv', '--x', 'day', '--y', 'level', '--json'], { readFile: () => text, out: (t) => out.push(t), err: (t) => err.push(t) });
      return { code, out, err };
    };
    // each candidate's time (milliseconds) differs between runs
    const timeless = (r: { out: string[] }) => ({ ...r, out: r.out.map((t) => t.replace(/"milliseconds":\d+/g, '"milliseconds":0')) });
    const a = run(fast), b = run(general);
    expect(a.err).toEqual([]);
    expect(a.code).toBe(0);
    expect(timeless(a)).toEqual(timeless(b));
    expect(JSON.parse(a.out[0]).fitted).toHaveLength(60);
  });
});
