/**
 * A cache of candidate motions, so each design is swept once per resolution however
 * often the table re-renders while a search runs. Table rows ask lazily: their sweeps
 * run in idle time, a slice at a time, and only while the row is still on screen. The
 * detail and compare views ask for theirs at once.
 */
import { startTransition, useEffect, useMemo, useState } from 'react';
import type { CandidateReport } from '../../core/synthesis';
import { computeMotion, type MotionResult } from './motion';
import { candidateKey } from './state';

/** Motions kept (least recently used dropped first): a few hundred rows at two resolutions. */
const MAX_ENTRIES = 800;
/**
 * Time (ms) one idle slice may spend on sweeps, whatever deadline the browser offers: far
 * below the 50 ms that counts as a long task, so a running search's page stays responsive.
 */
const SLICE_MS = 8;

type Listener = () => void;

interface Pending {
  readonly id: string;
  readonly compute: () => MotionResult;
}

export class MotionStore {
  private readonly entries = new Map<string, MotionResult>();
  private readonly listeners = new Map<string, Set<Listener>>();
  private readonly queue: Pending[] = [];
  private readonly queued = new Set<string>();
  private scheduled = false;

  get(id: string): MotionResult | undefined {
    return this.entries.get(id);
  }

  getOrCompute(id: string, compute: () => MotionResult): MotionResult {
    const found = this.entries.get(id);
    if (found !== undefined) {
      // Refresh its place in the least-recently-used order.
      this.entries.delete(id);
      this.entries.set(id, found);
      return found;
    }
    const result = compute();
    this.put(id, result);
    return result;
  }

  /** Computes `id` in idle time and tells its listeners. */
  request(id: string, compute: () => MotionResult): void {
    if (this.entries.has(id) || this.queued.has(id)) return;
    this.queue.push({ id, compute });
    this.queued.add(id);
    this.schedule();
  }

  subscribe(id: string, listener: Listener): () => void {
    let set = this.listeners.get(id);
    if (set === undefined) {
      set = new Set();
      this.listeners.set(id, set);
    }
    set.add(listener);
    return () => {
      set.delete(listener);
      if (set.size === 0) this.listeners.delete(id);
    };
  }

  private put(id: string, result: MotionResult): void {
    this.entries.set(id, result);
    while (this.entries.size > MAX_ENTRIES) {
      const oldest = this.entries.keys().next().value;
      if (oldest === undefined) break;
      this.entries.delete(oldest);
    }
    for (const listener of this.listeners.get(id) ?? []) listener();
  }

  private schedule(): void {
    if (this.scheduled) return;
    this.scheduled = true;
    const run = (timeLeft: () => number) => {
      this.scheduled = false;
      while (this.queue.length > 0 && timeLeft() > 0) {
        const next = this.queue.shift();
        if (next === undefined) break;
        this.queued.delete(next.id);
        // A row scrolled away or replaced meanwhile no longer needs its sweep.
        if (!this.listeners.has(next.id) || this.entries.has(next.id)) continue;
        this.put(next.id, next.compute());
      }
      if (this.queue.length > 0) this.schedule();
    };
    const slice = (deadline?: IdleDeadline) => {
      const start = performance.now();
      run(() => Math.min(deadline ? deadline.timeRemaining() : Infinity, SLICE_MS - (performance.now() - start)));
    };
    if (typeof requestIdleCallback === 'function') requestIdleCallback(slice, { timeout: 500 });
    else setTimeout(slice, 0);
  }
}

/** The app's one store of motions. */
export const motionStore = new MotionStore();

function motionId(candidate: CandidateReport, steps: number): string {
  return `${candidateKey(candidate)}|${steps}`;
}

function computeFor(candidate: CandidateReport, steps: number): () => MotionResult {
  return () => computeMotion(candidate, steps);
}

/** The motion now, computing it if need be (the detail and compare views). */
export function motionNow(candidate: CandidateReport, steps: number): MotionResult {
  return motionStore.getOrCompute(motionId(candidate, steps), computeFor(candidate, steps));
}

/**
 * The motion once computed in idle time; undefined until then (table rows). A finished
 * sweep re-renders its row in a transition, which React may interrupt, so twenty rows
 * arriving at once never make one long task. A computed motion never changes, so
 * reading the store during render shows no tearing.
 */
export function useLazyMotion(candidate: CandidateReport, steps: number): MotionResult | undefined {
  const id = motionId(candidate, steps);
  const [, setArrivals] = useState(0);
  const motion = motionStore.get(id);
  const missing = motion === undefined;
  useEffect(() => {
    if (!missing) return;
    const arrived = () => startTransition(() => setArrivals((n) => n + 1));
    const unsubscribe = motionStore.subscribe(id, arrived);
    // Swept between the render and this effect: nothing will call, so look now.
    if (motionStore.get(id) !== undefined) arrived();
    else motionStore.request(id, computeFor(candidate, steps));
    return unsubscribe;
  }, [id, missing, candidate, steps]);
  return motion;
}

/** The motion at once, memoised per candidate (the detail view). */
export function useMotionNow(candidate: CandidateReport, steps: number): MotionResult {
  return useMemo(() => motionNow(candidate, steps), [candidate, steps]);
}
