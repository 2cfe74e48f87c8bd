/**
 * "Run this in a task of its own", by a message rather than a timer. The engine splits its
 * main-thread work (a checkpoint's encoding, the merge of each slice) into tasks so a page
 * never stalls on one; a zero-delay timer would do that too, but browsers throttle timers
 * in a hidden tab (chained ones to one a second), and a search left in a background tab
 * would then wait seconds at every checkpoint. Messages are not throttled. MessageChannel
 * is the same in browsers and in Node, and a closed port keeps no Node process alive.
 */

const pending: (() => void)[] = [];
/** Open while tasks are pending (a chain of tasks reuses it), closed once none is left, so an idle engine holds no port open. */
let channel: MessageChannel | null = null;

function runNext(): void {
  const run = pending.shift();
  try {
    run?.();
  } finally {
    if (pending.length === 0 && channel !== null) {
      channel.port1.close();
      channel = null;
    }
  }
}

/** Calls `run` in a task of its own, after whatever is queued. */
export function queueTask(run: () => void): void {
  if (channel === null) {
    channel = new MessageChannel();
    channel.port1.onmessage = runNext;
  }
  pending.push(run);
  channel.port2.postMessage(null);
}

/** Resolves in a task of its own, after whatever else is queued (renders, input, messages). */
export function nextTask(): Promise<void> {
  return new Promise((resolve) => queueTask(resolve));
}
