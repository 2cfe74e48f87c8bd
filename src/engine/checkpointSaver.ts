/**
 * A run's checkpoints on their way out: encoded in short tasks, saved to the run's store
 * (if any), a failed save told and remembered until one succeeds, and each saved payload
 * told to the caller in a task of its own.
 */
import { encodeCheckpointInSteps, type CheckpointPayload } from './checkpoint';
import type { CheckpointStore } from './checkpointStore';
import { nextTask, queueTask } from './nextTask';

/** A checkpoint's text, encoded in short tasks: on the page's thread, no step is a long task. */
export function encodeInTasks(payload: CheckpointPayload): Promise<string> {
  return encodeCheckpointInSteps(payload, nextTask);
}

export class CheckpointSaver {
  private failure: string | null = null;

  constructor(
    private readonly store: CheckpointStore | null,
    private readonly onCheckpoint: ((payload: CheckpointPayload) => void) | null,
    private readonly onSaveError: ((reason: string) => void) | null,
  ) {}

  /** Why the last save failed; null once one succeeds. */
  get error(): string | null {
    return this.failure;
  }

  /**
   * Saves the checkpoint to the store, if any, and returns its text (null with no store).
   * A failed save is told to `onSaveError` and the run goes on: its results matter more
   * than one checkpoint, and the next save may succeed.
   */
  async save(payload: CheckpointPayload): Promise<string | null> {
    let text: string | null = null;
    if (this.store !== null) {
      text = await encodeInTasks(payload);
      try {
        await this.store.save(text);
        this.failure = null;
      } catch (error) {
        this.failure = error instanceof Error ? error.message : String(error);
        this.onSaveError?.(this.failure);
        return text;
      }
    }
    const listener = this.onCheckpoint;
    if (listener !== null) queueTask(() => listener(payload));
    return text;
  }
}
