/**
 * Engine scaling, in one run: evaluations per second of the engine at 1 and 2 workers on
 * the three published four-bar problems (tests/reference/problems), beside the machine's
 * own two-thread ratios for plain arithmetic and for each problem's objective alone in
 * bare threads (plainThreads.ts: the most two workers of that problem can give here);
 * then 16 islands on 16 workers against the same 16 islands on 2 workers, both on this
 * machine's cores.
 *
 * Each engine run is the synthesis bench's search (4 islands of the hybrid optimizer)
 * over 800,000 evaluations, deterministic (same seed and budget at every worker
 * count, so the same evaluations, and the bench fails if they end on different best
 * values). Rates are the steady state: from the first slice every island has done past a
 * quarter of the budget to the last, so fresh workers' start-up, JIT warm-up (each
 * worker compiles the same code again, on background threads that take a core from the
 * other worker at 2 workers and an idle core at 1) and the final description fall
 * outside; the same figures from the first slice on (`…FromFirstSlice`) show what the
 * warm-up costs. Worker counts are interleaved over rounds and each keeps its best rate, as is
 * the controls'. Beside each rate, where the time went: the share of the
 * window each worker's event loop was busy (the rest it waited for a message), the
 * main thread's, messages per million evaluations, and CPU milliseconds per million
 * evaluations of the main thread and of the other threads (the workers; equal at 1 and
 * 2 workers when the engine adds no work, whatever the load), and of those the share of
 * V8's background threads (JIT compiler, garbage-collector helpers).
 *
 * Each case also runs under a time budget (`…TimeBudget`), as an overnight search does:
 * there every slice lasts the engine's slice time instead of a fixed number of
 * evaluations, so a worker whose islands are in a costlier phase (a Nelder–Mead polish
 * costs more per evaluation than a differential-evolution generation on these cheap
 * problems) does not hold the other back, as it does when slices are counted in
 * evaluations and the run must come out the same on any number of workers. Those runs
 * are not deterministic; their window is from a quarter to END_SHARE of the time.
 *
 * The 16-worker figure is simulated, not a 16-core measurement: on 2 cores, 16 workers
 * share the cores 8 to a core, so what it shows is the cost of orchestrating 16 workers
 * (messages, merges, waits) against 2 on the same work: `sixteenOverTwoWorkerRatio` is
 * 1 when that costs nothing. The main thread's busy time per evaluation, times the
 * evaluations/s 16 cores would give, says how busy it would be on a 16-core machine.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { performance, type EventLoopUtilization } from 'node:perf_hooks';
import { createRun, type RunInput } from '../src/engine';
import { nodeEnvironment, spawnNodeSearchWorker, type NodeWorkerHandle } from '../src/engine/node';
import { objectiveThreads, spin } from './plainThreads';

const CASES = ['line6-untimed', 'timed5', 'closed18-untimed'] as const;
/** The published problems' family. */
const FAMILY = 'fourbar-lengths';
const ISLANDS = 4;
const EVALUATIONS = 800_000;
/** Share of the budget done before the steady window opens: each worker's JIT warm-up runs past the first slice. */
const WARM_UP_SHARE = 0.25;
/**
 * The same searches under a time budget (an overnight run's mode: slices of a fixed time,
 * not of a fixed number of evaluations), seconds each; its window closes at the first
 * report past END_SHARE of that time, before the run winds down.
 */
const TIME_BUDGET_S = 10;
const END_SHARE = 0.9;
/** Interleaved rounds of 1 and 2 workers (and of the control); each keeps its best. */
const ROUNDS = 2;
const SIMULATED_WORKERS = 16;
const SIMULATED_EVALUATIONS = 800_000;

function problemFile(caseId: string): unknown {
  return JSON.parse(readFileSync(new URL(`../tests/reference/problems/${caseId}.json`, import.meta.url), 'utf8'));
}

function spec(caseId: string, islands: number, evaluations: number): RunInput {
  return {
    jobs: [{ id: caseId, objective: { kind: 'synthesis', problem: problemFile(caseId), family: FAMILY }, seed: 1, islands, optimizer: { kind: 'hybrid' } }],
    budget: { evaluations },
    deterministic: true,
  };
}

/** The same job under a time budget: slices of the engine's default time, not deterministic. */
function timedSpec(caseId: string, seconds: number): RunInput {
  return { ...spec(caseId, ISLANDS, 1), budget: { seconds }, deterministic: false };
}

/** Clock ticks per second of /proc's CPU times (USER_HZ; 100 on Linux). */
const USER_HZ = 100;
const MAIN_THREAD_STAT = `/proc/self/task/${process.pid}/stat`;

/**
 * CPU milliseconds the main thread has used (Linux /proc, 10 ms resolution), or null
 * elsewhere. CPU time, unlike the event loop's busy time, does not grow while other
 * processes hold the cores.
 */
function mainThreadCpuMs(): number | null {
  if (!existsSync(MAIN_THREAD_STAT)) return null;
  const stat = readFileSync(MAIN_THREAD_STAT, 'utf8');
  // Fields after the command name (which may hold spaces) in parentheses: utime and stime are the 12th and 13th.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / USER_HZ;
}

/** Threads of this process before any worker starts: the main thread, V8's background threads (compiler, garbage collector helpers), libuv's. */
const THREADS_AT_START = new Set(existsSync('/proc/self/task') ? readdirSync('/proc/self/task') : []);

/**
 * CPU milliseconds of the threads that were there at the start, but the main thread (V8's
 * background compiler and garbage-collector helpers, shared by every isolate), or null
 * off Linux. What the workers' own threads use is the rest of the other threads' time.
 */
function backgroundThreadsCpuMs(): number | null {
  if (!existsSync('/proc/self/task')) return null;
  let ms = 0;
  for (const tid of readdirSync('/proc/self/task')) {
    if (tid === String(process.pid) || !THREADS_AT_START.has(tid)) continue;
    try {
      const stat = readFileSync(`/proc/self/task/${tid}/stat`, 'utf8');
      const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      ms += ((Number(fields[11]) + Number(fields[12])) * 1000) / USER_HZ;
    } catch {
      // A thread that ended between the listing and the read: its time is lost to both marks alike.
    }
  }
  return ms;
}

/** CPU milliseconds of the whole process (every thread). */
function processCpuMs(): number {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1000;
}

interface Measured {
  readonly evalsPerS: number;
  readonly best: number;
  /** Share of the steady window each worker's event loop was busy, mean over the workers. */
  readonly workerBusyShare: number;
  readonly mainBusyShare: number;
  /** Main-thread busy milliseconds per million evaluations (event loop). */
  readonly mainMsPerMillionEvals: number;
  /** Main-thread CPU milliseconds per million evaluations; null off Linux. */
  readonly mainCpuMsPerMillionEvals: number | null;
  /** CPU milliseconds of every other thread (the workers, mostly) per million evaluations. */
  readonly otherCpuMsPerMillionEvals: number | null;
  /** Of those, V8's background threads' (JIT compiler, garbage-collector helpers); null off Linux. */
  readonly backgroundCpuMsPerMillionEvals: number | null;
  readonly messagesPerMillionEvals: number;
}

interface Mark {
  readonly evaluations: number;
  readonly ms: number;
  readonly main: EventLoopUtilization;
  readonly workers: EventLoopUtilization[];
  readonly messages: number;
  readonly mainCpuMs: number | null;
  readonly backgroundCpuMs: number | null;
  readonly processCpuMs: number;
}

/** The figures of the window between two marks. */
function windowFigures(first: Mark, last: Mark, best: number): Measured {
  const evaluations = last.evaluations - first.evaluations;
  const ms = last.ms - first.ms;
  const main = performance.eventLoopUtilization(last.main, first.main);
  const busy = last.workers.flatMap((w, k) => (k < first.workers.length ? [performance.eventLoopUtilization(w, first.workers[k]).utilization] : []));
  const mainCpu = last.mainCpuMs === null || first.mainCpuMs === null ? null : last.mainCpuMs - first.mainCpuMs;
  return {
    evalsPerS: (evaluations * 1000) / ms,
    mainCpuMsPerMillionEvals: mainCpu === null ? null : (mainCpu * 1e6) / evaluations,
    otherCpuMsPerMillionEvals: mainCpu === null ? null : ((last.processCpuMs - first.processCpuMs - mainCpu) * 1e6) / evaluations,
    backgroundCpuMsPerMillionEvals:
      last.backgroundCpuMs === null || first.backgroundCpuMs === null ? null : ((last.backgroundCpuMs - first.backgroundCpuMs) * 1e6) / evaluations,
    best,
    workerBusyShare: busy.reduce((a, b) => a + b, 0) / busy.length,
    mainBusyShare: main.utilization,
    mainMsPerMillionEvals: (main.active * 1e6) / evaluations,
    messagesPerMillionEvals: ((last.messages - first.messages) * 1e6) / evaluations,
  };
}

/** The steady window (from WARM_UP_SHARE of the budget) and the window from the first slice, of one run. */
interface Windows {
  readonly steady: Measured;
  readonly fromFirstSlice: Measured;
}

async function measure(input: RunInput, workers: number): Promise<Windows> {
  const handles: NodeWorkerHandle[] = [];
  let messages = 0;
  const env = nodeEnvironment(() => {
    const handle = spawnNodeSearchWorker();
    handles.push(handle);
    const post = handle.endpoint.postMessage.bind(handle.endpoint);
    handle.endpoint.postMessage = (message: unknown, transfer?: Transferable[]) => {
      messages++;
      post(message, transfer);
    };
    return handle;
  });
  const made = createRun(env, input, { workers, topK: 1 });
  if (!made.ok) throw new Error(made.reason);
  const marks: Mark[] = [];
  const t0 = performance.now();
  // The share of the budget done: of its evaluations, or of its time (ending at END_SHARE).
  const { evaluations: budget, seconds } = input.budget;
  const done = (evaluations: number) => (typeof budget === 'number' ? evaluations / budget : (performance.now() - t0) / (END_SHARE * 1000 * (seconds ?? Infinity)));
  made.run.onProgress((p) => {
    // Marks at the first slice, the first past the warm-up share and the one that ends the
    // budget only: the bench adds no work to the slices between.
    if (p.status !== 'running' || p.rounds < 1 || marks.length === 3) return;
    if (marks.length === 1 && done(p.evaluations) < WARM_UP_SHARE) return;
    if (marks.length === 2 && done(p.evaluations) < 1) return;
    const mark = {
      evaluations: p.evaluations,
      ms: performance.now(),
      main: performance.eventLoopUtilization(),
      workers: handles.map((h) => h.worker.performance.eventLoopUtilization()),
      messages,
      mainCpuMs: mainThreadCpuMs(),
      backgroundCpuMs: backgroundThreadsCpuMs(),
      processCpuMs: processCpuMs(),
    };
    marks.push(mark);
  });
  const result = await made.run.start();
  if (!result.ok) throw new Error(result.reason);
  if (marks.length < 3) throw new Error('bench: the run reported too few slices for a window past its warm-up; give it more evaluations');
  const [first, warm, last] = marks;
  const best = result.candidates[0]?.value ?? NaN;
  return { steady: windowFigures(warm, last, best), fromFirstSlice: windowFigures(first, last, best) };
}

type Row = Record<string, number | string | null>;

export async function benchScaling(): Promise<Row[]> {
  const loadAtStart = loadavg()[0];
  const best = new Map<string, { one: Windows | null; two: Windows | null }>(CASES.map((c) => [c, { one: null, two: null }]));
  const timed = new Map<string, { one: Measured | null; two: Measured | null }>(CASES.map((c) => [c, { one: null, two: null }]));
  let spinOne = 0;
  let spinTwo = 0;
  const objectiveControl = new Map(CASES.map((c) => [c, { one: 0, two: 0 }]));
  for (let round = 0; round < ROUNDS; round++) {
    spinOne = Math.max(spinOne, await spin(1));
    spinTwo = Math.max(spinTwo, await spin(2));
    for (const caseId of CASES) {
      const bare = objectiveControl.get(caseId) as { one: number; two: number };
      bare.one = Math.max(bare.one, await objectiveThreads(1, problemFile(caseId), FAMILY));
      bare.two = Math.max(bare.two, await objectiveThreads(2, problemFile(caseId), FAMILY));
      const entry = best.get(caseId) as { one: Windows | null; two: Windows | null };
      for (const workers of [1, 2] as const) {
        const m = await measure(spec(caseId, ISLANDS, EVALUATIONS), workers);
        const other = workers === 1 ? entry.two : entry.one;
        const same = workers === 1 ? entry.one : entry.two;
        for (const seen of [other, same]) {
          if (seen !== null && !Object.is(seen.steady.best, m.steady.best)) {
            throw new Error(`${caseId}: runs ended on different best values (${seen.steady.best} and ${m.steady.best}); the schedule is not deterministic`);
          }
        }
        if (workers === 1 && (entry.one === null || m.steady.evalsPerS > entry.one.steady.evalsPerS)) entry.one = m;
        if (workers === 2 && (entry.two === null || m.steady.evalsPerS > entry.two.steady.evalsPerS)) entry.two = m;
      }
      const byTime = timed.get(caseId) as { one: Measured | null; two: Measured | null };
      for (const workers of [1, 2] as const) {
        const m = (await measure(timedSpec(caseId, TIME_BUDGET_S), workers)).steady;
        if (workers === 1 && (byTime.one === null || m.evalsPerS > byTime.one.evalsPerS)) byTime.one = m;
        if (workers === 2 && (byTime.two === null || m.evalsPerS > byTime.two.evalsPerS)) byTime.two = m;
      }
    }
  }
  const control = spinTwo / spinOne;
  const rows: Row[] = [];
  for (const caseId of CASES) {
    const windows = best.get(caseId) as { one: Windows; two: Windows };
    const one = windows.one.steady;
    const two = windows.two.steady;
    const ratio = two.evalsPerS / one.evalsPerS;
    const ratioFromFirstSlice = windows.two.fromFirstSlice.evalsPerS / windows.one.fromFirstSlice.evalsPerS;
    const byTime = timed.get(caseId) as { one: Measured; two: Measured };
    const timedRatio = byTime.two.evalsPerS / byTime.one.evalsPerS;
    const bare = objectiveControl.get(caseId) as { one: number; two: number };
    const objectiveRatio = bare.two / bare.one;
    rows.push({
      case: caseId,
      evalsPerS1Worker: one.evalsPerS,
      evalsPerS2Workers: two.evalsPerS,
      twoOverOneWorkerRatio: ratio,
      ratioOverControlRatio: ratio / control,
      objectiveControlEvalsPerS1Thread: bare.one,
      objectiveControlTwoOverOneThreadRatio: objectiveRatio,
      ratioOverObjectiveControlRatio: ratio / objectiveRatio,
      workerBusyShare1Worker: one.workerBusyShare,
      workerBusyShare2Workers: two.workerBusyShare,
      mainBusyShare2Workers: two.mainBusyShare,
      mainCpuMsPerMillionEvals2Workers: two.mainCpuMsPerMillionEvals,
      workerCpuMsPerMillionEvals1Worker: one.otherCpuMsPerMillionEvals,
      workerCpuMsPerMillionEvals2Workers: two.otherCpuMsPerMillionEvals,
      backgroundCpuMsPerMillionEvals1Worker: one.backgroundCpuMsPerMillionEvals,
      backgroundCpuMsPerMillionEvals2Workers: two.backgroundCpuMsPerMillionEvals,
      messagesPerMillionEvals2Workers: two.messagesPerMillionEvals,
      twoOverOneWorkerRatioFromFirstSlice: ratioFromFirstSlice,
      workerCpuMsPerMillionEvals1WorkerFromFirstSlice: windows.one.fromFirstSlice.otherCpuMsPerMillionEvals,
      workerCpuMsPerMillionEvals2WorkersFromFirstSlice: windows.two.fromFirstSlice.otherCpuMsPerMillionEvals,
      bestValueChecksum: one.best,
      evalsPerS1WorkerTimeBudget: byTime.one.evalsPerS,
      evalsPerS2WorkersTimeBudget: byTime.two.evalsPerS,
      twoOverOneWorkerRatioTimeBudget: timedRatio,
      ratioOverControlRatioTimeBudget: timedRatio / control,
      ratioOverObjectiveControlRatioTimeBudget: timedRatio / objectiveRatio,
      workerBusyShare2WorkersTimeBudget: byTime.two.workerBusyShare,
      workerCpuMsPerMillionEvals1WorkerTimeBudget: byTime.one.otherCpuMsPerMillionEvals,
      workerCpuMsPerMillionEvals2WorkersTimeBudget: byTime.two.otherCpuMsPerMillionEvals,
    });
  }
  rows.push({ case: 'plain-arithmetic control', twoOverOneThreadRatio: control });

  const two = (await measure(spec('timed5', SIMULATED_WORKERS, SIMULATED_EVALUATIONS), 2)).steady;
  const sixteen = (await measure(spec('timed5', SIMULATED_WORKERS, SIMULATED_EVALUATIONS), SIMULATED_WORKERS)).steady;
  if (!Object.is(two.best, sixteen.best)) throw new Error(`16 islands: 2 and 16 workers ended on different best values (${two.best}, ${sixteen.best})`);
  const oneCoreRate = (best.get('timed5') as { one: Windows }).one.steady.evalsPerS;
  // Main-thread CPU ms per evaluation × the evaluations/s of 16 cores, each as fast as one worker here.
  const mainMsPerEval = (sixteen.mainCpuMsPerMillionEvals ?? sixteen.mainMsPerMillionEvals) / 1e6;
  const projectedMainBusyShareAt16Cores = (mainMsPerEval * SIMULATED_WORKERS * oneCoreRate) / 1000;
  rows.push({
    case: `timed5, ${SIMULATED_WORKERS} islands (simulated: ${SIMULATED_WORKERS} workers on ${availableParallelism()} cores)`,
    evalsPerS2Workers: two.evalsPerS,
    evalsPerS16Workers: sixteen.evalsPerS,
    sixteenOverTwoWorkerRatio: sixteen.evalsPerS / two.evalsPerS,
    mainCpuMsPerMillionEvals2Workers: two.mainCpuMsPerMillionEvals,
    mainCpuMsPerMillionEvals16Workers: sixteen.mainCpuMsPerMillionEvals,
    workerCpuMsPerMillionEvals2Workers: two.otherCpuMsPerMillionEvals,
    workerCpuMsPerMillionEvals16Workers: sixteen.otherCpuMsPerMillionEvals,
    workerBusyShare16Workers: sixteen.workerBusyShare,
    // Above 1: each evaluation costs the workers more CPU at 16 (JIT warm-up per worker, caches refilled 8 threads to a core), not waiting.
    workerCpuPerEvalSixteenOverTwoRatio:
      sixteen.otherCpuMsPerMillionEvals === null || two.otherCpuMsPerMillionEvals === null ? null : sixteen.otherCpuMsPerMillionEvals / two.otherCpuMsPerMillionEvals,
    messagesPerMillionEvals16Workers: sixteen.messagesPerMillionEvals,
    projectedMainBusyShareAt16Cores,
  });
  rows.push({ case: 'load', loadAverage1MinStart: loadAtStart, loadAverage1MinEnd: loadavg()[0], cores: availableParallelism() });
  return rows;
}
