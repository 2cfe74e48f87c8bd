/** Reads target CSV text off the page's thread: a megabyte takes longer than a frame should. */
import '../strictPolicy';
import { parsePointsCsv } from '../../core/io/pointsCsv';

globalThis.onmessage = (event: MessageEvent<string>) => {
  globalThis.postMessage(parsePointsCsv(event.data));
};
