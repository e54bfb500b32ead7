// Group commit for document updates: updates that arrive while a write is in flight (or within the
// same turn of the event loop) go to the database together in one multi-row INSERT. Each caller
// learns when its update is committed; only then may it be passed on to other clients.
import type { UpdateRow } from './store';

export interface QueuedUpdate<Tag> extends UpdateRow {
  /** Carried through to onCommitted (the room and what it needs to broadcast). */
  tag: Tag;
}

export interface UpdateWriterOptions<Tag> {
  append(rows: readonly UpdateRow[]): Promise<void>;
  /** Called once per committed batch, with the rows in the order they were queued. */
  onCommitted(batch: readonly QueuedUpdate<Tag>[]): void;
  /** Called when a write fails; the batch stays queued and is tried again. */
  onFailure(error: unknown, attempt: number): void;
}

const RETRY_FIRST_MS = 100;
const RETRY_MAX_MS = 5_000;

export class UpdateWriter<Tag> {
  private queue: QueuedUpdate<Tag>[] = [];
  private running = false;
  private idleWaiters: (() => void)[] = [];
  private failures = 0;

  constructor(private readonly options: UpdateWriterOptions<Tag>) {}

  get pending(): number {
    return this.queue.length;
  }

  /** Consecutive failed attempts of the current batch (0 while writes succeed). */
  get failing(): number {
    return this.failures;
  }

  enqueue(item: QueuedUpdate<Tag>): void {
    this.queue.push(item);
    if (!this.running) {
      this.running = true;
      // The messages of the same socket read join this batch; those arriving while it is being
      // written go together in the next.
      queueMicrotask(() => void this.drain());
    }
  }

  /** Resolves when everything queued so far (and since) is committed. */
  idle(): Promise<void> {
    if (!this.running && this.queue.length === 0) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  private async drain(): Promise<void> {
    while (this.queue.length > 0) {
      const batch = this.queue;
      this.queue = [];
      try {
        await this.options.append(batch);
      } catch (error) {
        this.failures++;
        this.queue = batch.concat(this.queue);
        this.options.onFailure(error, this.failures);
        await new Promise((resolve) => setTimeout(resolve, Math.min(RETRY_MAX_MS, RETRY_FIRST_MS * 2 ** (this.failures - 1))));
        continue;
      }
      this.failures = 0;
      try {
        this.options.onCommitted(batch);
      } catch (error) {
        console.error('collab: passing on committed updates failed:', error);
      }
    }
    this.running = false;
    const waiters = this.idleWaiters;
    this.idleWaiters = [];
    for (const resolve of waiters) resolve();
  }
}
