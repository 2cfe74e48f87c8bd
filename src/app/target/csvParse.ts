/** Target CSV text read in a worker of its own, so a long text never holds the page; the page's own thread if no worker starts. */
import { parsePointsCsv, type PointsCsvResult } from '../../core/io/pointsCsv';

export function parsePointsCsvOffThread(text: string): Promise<PointsCsvResult> {
  return new Promise((resolve) => {
    let worker: Worker;
    try {
      worker = new Worker(new URL('./csvParseWorker.ts', import.meta.url), { type: 'module' });
    } catch {
      // A page whose policy forbids workers: slower, but nothing is lost.
      resolve(parsePointsCsv(text));
      return;
    }
    worker.onmessage = (event: MessageEvent<PointsCsvResult>) => {
      worker.terminate();
      resolve(event.data);
    };
    worker.onerror = () => {
      worker.terminate();
      resolve(parsePointsCsv(text));
    };
    worker.postMessage(text);
  });
}
