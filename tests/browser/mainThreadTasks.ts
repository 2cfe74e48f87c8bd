/**
 * The page's main-thread tasks by the CPU time they took, from a Chromium trace taken
 * through the DevTools protocol (`Tracing`, the `devtools.timeline` categories: each `RunTask`
 * event carries `tdur`, the task's thread time in µs, beside `dur`, its wall time).
 *
 * Why CPU time: the browser's long-task measure (a task over 50 ms of wall time) grows
 * with the machine's load, since a task preempted by other processes lasts longer on
 * the clock; the CPU time a task takes on its thread is the work the page did, which is
 * what a test of the app's responsiveness is about and what it can assert on a loaded
 * machine.
 */
import type { CDPSession, Page } from 'playwright-core';

interface TraceEvent {
  readonly name: string;
  readonly cat?: string;
  readonly ph: string;
  readonly pid: number;
  readonly tid: number;
  readonly ts: number;
  readonly dur?: number;
  readonly tdur?: number;
  readonly args?: { readonly name?: string };
}

/** One main-thread task: when it started (trace clock, µs) and its CPU time, ms. */
export interface MainThreadTask {
  readonly startUs: number;
  readonly cpuMs: number;
}

export interface MainThreadTrace {
  /**
   * Ends the trace; the page main threads' tasks while it ran, in order, and when the
   * page's `performance.mark`s of that time were set (trace clock, µs, by name).
   */
  stop(): Promise<{ readonly tasks: MainThreadTask[]; readonly marks: ReadonlyMap<string, number> }>;
}

async function readStream(cdp: CDPSession, handle: string): Promise<string> {
  const parts: string[] = [];
  // A trace of a minute is a few MB; the protocol hands it over in chunks until eof.
  for (let chunks = 0; chunks < 100_000; chunks++) {
    const chunk = await cdp.send('IO.read', { handle });
    parts.push(chunk.base64Encoded === true ? Buffer.from(chunk.data, 'base64').toString('utf8') : chunk.data);
    if (chunk.eof) break;
  }
  await cdp.send('IO.close', { handle });
  return parts.join('');
}

/** Starts tracing the page's renderer; `stop` gives the tasks of its main thread (`CrRendererMain`). */
export async function traceMainThread(page: Page): Promise<MainThreadTrace> {
  const cdp = await page.context().newCDPSession(page);
  // Tasks (`RunTask`) are recorded under the timeline's detailed category only; marks under user timing.
  await cdp.send('Tracing.start', { categories: 'devtools.timeline,disabled-by-default-devtools.timeline,blink.user_timing', transferMode: 'ReturnAsStream' });
  return {
    async stop() {
      const complete = new Promise<string>((resolve, reject) => {
        cdp.once('Tracing.tracingComplete', (event) => (event.stream === undefined ? reject(new Error('the trace came without a stream')) : resolve(event.stream)));
      });
      await cdp.send('Tracing.end');
      const text = await readStream(cdp, await complete);
      await cdp.detach();
      const parsed = JSON.parse(text) as TraceEvent[] | { traceEvents: TraceEvent[] };
      const events = Array.isArray(parsed) ? parsed : parsed.traceEvents;
      const mainThreads = new Set(events.filter((e) => e.name === 'thread_name' && e.args?.name === 'CrRendererMain').map((e) => `${e.pid}/${e.tid}`));
      if (mainThreads.size === 0) throw new Error('the trace names no renderer main thread');
      const tasks = events
        .filter((e) => e.name === 'RunTask' && e.ph === 'X' && mainThreads.has(`${e.pid}/${e.tid}`))
        .map((e) => {
          if (e.tdur === undefined) throw new Error('a task in the trace has no thread time (tdur)');
          return { startUs: e.ts, cpuMs: e.tdur / 1000 };
        })
        .sort((a, b) => a.startUs - b.startUs);
      const marks = new Map<string, number>();
      for (const e of events) if (e.cat === 'blink.user_timing' && mainThreads.has(`${e.pid}/${e.tid}`) && !marks.has(e.name)) marks.set(e.name, e.ts);
      return { tasks, marks };
    },
  };
}
