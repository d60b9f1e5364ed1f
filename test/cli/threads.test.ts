/**
 * Several --y columns in worker threads give the same output, in the same
 * order, with the same exit codes and messages, as the in-order run.
 */
import * as path from 'path';
import { runCli, runCliWith, CliIO } from '../../src/cli/main';
import { runColumnsInThreads } from '../../src/cli/threads';
import { weeklyOrdersCsv } from '../../src/demo/weeklyOrders';

/** A run's output with each candidate's time (milliseconds, which differ between runs) set to 0. */
const timeless = (r: { out: string[] }) => ({ ...r, out: r.out.map((t) => t.replace(/"milliseconds":\d+/g, '"milliseconds":0')) });

const loader = path.join(__dirname, '..', 'runtime', 'tsThread.js');
const entry = path.join(__dirname, '..', '..', 'src', 'cli', 'columnWorker.ts');
const inThreads = (jobs: Parameters<typeof runColumnsInThreads>[0]) => runColumnsInThreads(jobs, { threads: 2, file: loader, options: { workerOptions: { workerData: { entry } } } });

// The demo file plus a column of text, so that one column fails.
const demo = weeklyOrdersCsv().trim().split('\n').map((l, i) => `${l},${i === 0 ? 'label' : 'n/a'}`).join('\n') + '\n';

function io() {
  const out: string[] = [], err: string[] = [];
  const host: CliIO = { readFile: () => demo, out: (t) => out.push(t), err: (t) => err.push(t) };
  return { host, out, err };
}

async function both(argv: string[]) {
  const a = io(), b = io();
  const codeA = runCli(argv, a.host);
  const codeB = await runCliWith(argv, b.host, inThreads);
  return { a: { code: codeA, out: a.out, err: a.err }, b: { code: codeB, out: b.out, err: b.err } };
}

test('three --y columns of fit --json: the same array in the same order', async () => {
  const { a, b } = await both(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--y', 'returns', '--y', 'unit_cost', '--json']);
  expect(a.code).toBe(0);
  // with no method named the automatic choice runs, and each candidate's time differs between runs
  expect(JSON.parse(b.out[0])[0].candidates.length).toBeGreaterThan(3);
  expect(timeless(b)).toEqual(timeless(a));
  expect(JSON.parse(b.out[0]).map((r: { column: string }) => r.column)).toEqual(['orders', 'returns', 'unit_cost']);
});

test('breaks on two columns as text: the same lines', async () => {
  const { a, b } = await both(['breaks', 'd.csv', '--y', 'orders,returns', '--model', 'meanvar']);
  expect(a.code).toBe(0);
  expect(b).toEqual(a);
});

test('a failing column: the same message and exit code as the in-order run, nothing on stdout', async () => {
  const { a, b } = await both(['fit', 'd.csv', '--y', 'orders', '--y', 'label', '--y', 'returns']);
  expect(a.code).toBe(1);
  expect(a.out).toEqual([]);
  expect(a.err[0]).toMatch(/^knotwise: /);
  expect(b).toEqual(a);
});

test('a usage error raised while running a column keeps exit code 2', async () => {
  const { a, b } = await both(['fit', 'd.csv', '--y', 'orders', '--y', 'returns', '--rule', 'gcv', '--one-se']);
  expect(a.code).toBe(2);
  expect(b).toEqual(a);
});
