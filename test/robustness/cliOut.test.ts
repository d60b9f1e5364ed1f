/** knotwise fit|breaks --out FILE [--force]: the output goes to a file, and an existing file is never replaced without --force. */
import { runCli } from '../../src/cli/main';
import { memoryIO } from './fronts';

const Y = [12, 15, 11, 18, 16, 21, 19, 24, 22, 27, 25, 30];
const csvOf = (cells: string[]) => ['y', ...cells].join('\n') + '\n';

describe('--out FILE', () => {
  const data = csvOf(Y.map(String));

  test('writes the output to the file instead of the screen', () => {
    const io = memoryIO({ 'd.csv': data });
    expect(runCli(['fit', 'd.csv', '--json', '--out', 'fit.json'], io.host)).toBe(0);
    expect(io.out).toEqual([]);
    expect(JSON.parse(io.written['fit.json']).method).toBe('auto');
    const b = memoryIO({ 'd.csv': data });
    expect(runCli(['breaks', 'd.csv', '--out', 'breaks.txt'], b.host)).toBe(0);
    expect(b.written['breaks.txt']).toMatch(/^y: level model, 12 points/);
  });

  test('never replaces an existing file without --force: exit 1, one line naming the file, nothing computed or written', () => {
    const io = memoryIO({ 'd.csv': data, 'old.json': 'keep me' });
    expect(runCli(['fit', 'd.csv', '--out', 'old.json'], io.host)).toBe(1);
    expect(io.err).toEqual(['knotwise: old.json already exists; add --force to overwrite it, or choose another --out file.']);
    expect(io.written).toEqual({});
    const f = memoryIO({ 'd.csv': data, 'old.json': 'keep me' });
    expect(runCli(['fit', 'd.csv', '--out', 'old.json', '--force'], f.host)).toBe(0);
    expect(f.written['old.json']).toMatch(/^y: automatic choice, kept /);
  });

  test('a file created between the check and the write is not replaced either', () => {
    const io = memoryIO({ 'd.csv': data });
    const host = { ...io.host, exists: () => false };
    host.writeFile = (p: string, t: string, overwrite: boolean) => { if (!overwrite) throw Object.assign(new Error('EEXIST'), { code: 'EEXIST' }); io.written[p] = t; };
    expect(runCli(['fit', 'd.csv', '--out', 'late.json'], host)).toBe(1);
    expect(io.err[0]).toMatch(/late\.json already exists; add --force/);
  });

  test('--force alone is a usage error', () => {
    const io = memoryIO({ 'd.csv': data });
    expect(runCli(['fit', 'd.csv', '--force'], io.host)).toBe(2);
    expect(io.err).toEqual(['knotwise: --force only applies with --out FILE.']);
  });
});
