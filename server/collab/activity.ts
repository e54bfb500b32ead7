// Keeps derivations' "last edit" (updatedAt, updatedBy, and the editor among its authors) current
// from accepted edits, written every few seconds rather than on every keystroke.
import { touchDerivation } from '../derivations';

export class ActivityLog {
  /** derivationId → users who edited since the last write, the latest last. */
  private pending = new Map<string, string[]>();
  private timer: NodeJS.Timeout | null = null;
  private writing: Promise<void> = Promise.resolve();

  constructor(private readonly intervalMs: number) {}

  start(): void {
    this.timer ??= setInterval(() => void this.flush(), this.intervalMs);
    this.timer.unref();
  }

  note(derivationId: string, userId: string): void {
    const users = this.pending.get(derivationId);
    if (!users) {
      this.pending.set(derivationId, [userId]);
    } else if (users[users.length - 1] !== userId) {
      const at = users.indexOf(userId);
      if (at >= 0) users.splice(at, 1);
      users.push(userId);
    }
  }

  /** Writes what was noted; calls are serialised. */
  flush(): Promise<void> {
    this.writing = this.writing.then(async () => {
      const batch = this.pending;
      this.pending = new Map();
      for (const [derivationId, users] of batch) {
        for (const userId of users) {
          try {
            await touchDerivation(derivationId, userId);
          } catch (error) {
            console.error(`collab: recording the last edit of derivation ${derivationId} failed:`, error);
          }
        }
      }
    });
    return this.writing;
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.flush();
  }
}
