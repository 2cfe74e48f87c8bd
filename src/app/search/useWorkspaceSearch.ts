/**
 * A workspace's search over its opening and closing: a search the project holds as
 * running (a reload interrupted it) resumes on opening; closing while a search runs asks
 * first (`asking`), and closing stops it.
 */
import { useEffect, useState } from 'react';
import type { RunningSearchOf } from './controller';

export function useWorkspaceSearch<P>(
  controller: { readonly busy: boolean; resume(running: RunningSearchOf<P>): Promise<void>; stop(): void },
  /** The running search the project held when the workspace opened. */
  runningAtOpen: () => RunningSearchOf<P> | undefined,
  onClose: (() => void) | undefined,
): { readonly asking: boolean; readonly close: (() => void) | undefined; readonly keepOpen: () => void } {
  const [asking, setAsking] = useState(false);
  // Read once, when the workspace opens: the controller lives as long as the workspace.
  const [atOpen] = useState(runningAtOpen);
  useEffect(() => {
    if (atOpen !== undefined) void controller.resume(atOpen);
    return () => controller.stop();
  }, [controller, atOpen]);
  const close = onClose === undefined ? undefined : () => (controller.busy ? setAsking(true) : onClose());
  return { asking, close, keepOpen: () => setAsking(false) };
}
