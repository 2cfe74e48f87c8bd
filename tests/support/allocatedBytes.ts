import v8 from 'node:v8';

/**
 * Heap bytes allocated while `work` runs: the used heap after minus before, plus what each
 * garbage collection in between freed (v8.GCProfiler reports each with the heap before and
 * after), so a collection neither hides bytes nor adds any. Bytes, not time: the figure
 * does not depend on the machine's speed or load.
 */
export function allocatedBytes(work: () => void): number {
  const profiler = new v8.GCProfiler();
  profiler.start();
  const before = v8.getHeapStatistics().used_heap_size;
  work();
  const after = v8.getHeapStatistics().used_heap_size;
  let freed = 0;
  for (const gc of profiler.stop().statistics) freed += gc.beforeGC.heapStatistics.usedHeapSize - gc.afterGC.heapStatistics.usedHeapSize;
  return after - before + freed;
}
