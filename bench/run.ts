/**
 * `npm run bench [-- name ...]`: runs the benchmarks (all, or those named), prints a
 * table of each one's figures, and ends with one JSON line per benchmark (its figures,
 * then `bench` and `wallS`), or per case of a benchmark that returns one row of figures
 * per case.
 * Figures are rates and ratios within one run on one machine; bench/README.md says
 * how to read them. Benchmarks are not tests: nothing here passes or fails on a time.
 */
import { performance } from 'node:perf_hooks';
import { benchAnalyzeChain } from './analyzeChain';
import { benchFamilies } from './families';
import { benchFamilyRates } from './familyRates';
import { benchHiddenTab } from './hiddenTab';
import { benchKernel } from './kernel';
import { benchMainThread } from './mainThread';
import { benchMatching } from './matching';
import { benchReach, benchReachQuick } from './reach';
import { benchScaling } from './scaling';
import { benchSoak } from './soak';
import { benchSuspension } from './suspension';
import { benchSynthesis } from './synthesis';

/** Figure name (with its unit, e.g. `solvesPerS`, `nmOverFminTimeRatio`) -> value; null: not reached. */
type Figures = Record<string, number | null>;
/** One case of a benchmark: its figures, and strings that name the case. */
type Row = Record<string, number | string | null>;

interface Bench {
  readonly name: string;
  run(): Promise<Figures | Row[]>;
  /** Runs only when named (minutes long); `npm run bench` alone leaves it out. */
  readonly onlyByName?: boolean;
}

const BENCHES: readonly Bench[] = [
  { name: 'kernel', run: benchKernel },
  { name: 'scaling', run: benchScaling },
  { name: 'synthesis', run: benchSynthesis },
  { name: 'suspension', run: benchSuspension },
  { name: 'analyze-chain', run: benchAnalyzeChain },
  { name: 'matching', run: benchMatching },
  { name: 'families', run: benchFamilies },
  { name: 'family-rates', run: benchFamilyRates },
  { name: 'hidden-tab', run: benchHiddenTab },
  { name: 'main-thread', run: benchMainThread },
  { name: 'reach', run: benchReach },
  { name: 'reach-quick', run: benchReachQuick, onlyByName: true },
  { name: 'soak', run: benchSoak, onlyByName: true },
];

type Outcome =
  | { readonly bench: string; readonly wallS: number; readonly figures: Figures }
  | { readonly bench: string; readonly wallS: number; readonly rows: Row[] }
  | { readonly bench: string; readonly wallS: number; readonly error: string };

function formatValue(value: number | string | null): string {
  if (typeof value === 'string' || value === null) return String(value);
  if (!Number.isFinite(value)) return String(value);
  if (Math.abs(value) >= 1000) return Math.round(value).toLocaleString('en-GB');
  if (Number.isInteger(value)) return String(value);
  return Number(value.toPrecision(4)).toString();
}

function figureTable(figures: Row): string[] {
  const rows = Object.entries(figures).map(([name, value]) => [name, formatValue(value)] as const);
  if (rows.length === 0) return ['  (no figures)'];
  const nameWidth = Math.max('figure'.length, ...rows.map(([name]) => name.length));
  const valueWidth = Math.max('value'.length, ...rows.map(([, value]) => value.length));
  const line = (name: string, value: string) => `  ${name.padEnd(nameWidth)}  ${value.padStart(valueWidth)}`;
  return [line('figure', 'value'), `  ${'-'.repeat(nameWidth + 2 + valueWidth)}`, ...rows.map(([n, v]) => line(n, v))];
}

function table(outcome: Outcome): string {
  const head = `${outcome.bench}  (${outcome.wallS.toFixed(2)} s wall)`;
  if ('error' in outcome) return `${head}\n  FAILED: ${outcome.error}`;
  if ('rows' in outcome) return [head, ...outcome.rows.flatMap((row) => ['', ...figureTable(row)])].join('\n');
  return [head, ...figureTable(outcome.figures)].join('\n');
}

/** Figures must be numbers (or null); strings are allowed only in the rows of a per-case bench. */
function checkFigures(result: unknown, strings: boolean): Row {
  if (typeof result !== 'object' || result === null || Array.isArray(result)) {
    throw new Error(`expected an object of named numbers, got ${Array.isArray(result) ? 'an array' : typeof result}`);
  }
  for (const [name, value] of Object.entries(result)) {
    if (!(typeof value === 'number' || value === null || (strings && typeof value === 'string'))) {
      throw new Error(`figure "${name}" is ${typeof value}, expected a number${strings ? ', a string' : ''} or null`);
    }
  }
  return result as Row;
}

async function runOne(bench: Bench): Promise<Outcome> {
  const startMs = performance.now();
  const wallS = () => Math.round(performance.now() - startMs) / 1000;
  try {
    const result: unknown = await bench.run();
    if (Array.isArray(result)) return { bench: bench.name, wallS: wallS(), rows: result.map((row) => checkFigures(row, true)) };
    const figures = checkFigures(result, false) as Figures;
    const clash = Object.keys(figures).find((name) => name === 'bench' || name === 'wallS');
    if (clash !== undefined) throw new Error(`figure "${clash}" has a name the JSON line keeps for the bench itself; rename it`);
    return { bench: bench.name, wallS: wallS(), figures };
  } catch (error) {
    const message = error instanceof Error ? (error.stack ?? error.message) : String(error);
    return { bench: bench.name, wallS: wallS(), error: message };
  }
}

function selectBenches(names: readonly string[]): readonly Bench[] | string {
  if (names.length === 0) return BENCHES.filter((bench) => bench.onlyByName !== true);
  const known = new Map(BENCHES.map((bench) => [bench.name, bench]));
  const unknown = names.filter((name) => !known.has(name));
  if (unknown.length > 0) {
    return `unknown bench ${unknown.map((n) => `"${n}"`).join(', ')}; known: ${BENCHES.map((b) => b.name).join(', ') || '(none)'}`;
  }
  return names.map((name) => known.get(name) as Bench);
}

async function main(): Promise<number> {
  const selected = selectBenches(process.argv.slice(2));
  if (typeof selected === 'string') {
    console.error(selected);
    return 2;
  }
  if (selected.length === 0) {
    console.error('no benchmarks are registered in bench/run.ts');
    return 2;
  }
  const outcomes: Outcome[] = [];
  for (const bench of selected) {
    const outcome = await runOne(bench);
    outcomes.push(outcome);
    console.log(`${table(outcome)}\n`);
  }
  // Machine-readable tail: one line per bench, its figures at the top level so a reader
  // takes a figure by name, then the bench's name and wall time; or one line per row of a
  // per-case bench. JSON has no Infinity or NaN: they print as null.
  for (const outcome of outcomes) {
    if ('rows' in outcome) for (const row of outcome.rows) console.log(JSON.stringify(row));
    else if ('error' in outcome) console.log(JSON.stringify(outcome));
    else console.log(JSON.stringify({ ...outcome.figures, bench: outcome.bench, wallS: outcome.wallS }));
  }
  return outcomes.some((outcome) => 'error' in outcome) ? 1 : 0;
}

void main().then((exitCode) => {
  process.exitCode = exitCode;
});
