/** Undo and redo history of the plan: whole plans as JSON, bounded in count and size. */

const HISTORY_LIMIT = 200;
/**
 * Undo and redo steps are whole plans as JSON; besides their count, their total length is
 * bounded (characters; twice that in bytes), so a few large plans cannot fill the memory.
 */
const HISTORY_CHARS = 20_000_000;

/** The committed plan (as JSON) with the steps before it (undo) and after it (redo). */
export class PlanHistory {
  private past: string[] = [];
  private future: string[] = [];

  /** committed: the plan as it stands at the last undo step, as JSON. */
  constructor(private committed: string) {}

  get canUndo(): boolean {
    return this.past.length > 0;
  }
  get canRedo(): boolean {
    return this.future.length > 0;
  }

  /** Characters held by the undo and redo steps. */
  get chars(): number {
    let n = 0;
    for (const h of this.past) n += h.length;
    for (const h of this.future) n += h.length;
    return n;
  }

  /** Makes the plan (as JSON) an undo step unless it equals the committed one. */
  commit(now: string): void {
    if (now === this.committed) return;
    this.past.push(this.committed);
    this.future = [];
    this.committed = now;
    this.trim();
  }

  /** Steps back: the plan (as JSON) to restore, or undefined when there is none. */
  undo(): string | undefined {
    return this.step(this.past, this.future);
  }

  /** Steps forward: the plan (as JSON) to restore, or undefined when there is none. */
  redo(): string | undefined {
    return this.step(this.future, this.past);
  }

  /** Moves the committed plan onto `to` and makes the last step of `from` the committed one. */
  private step(from: string[], to: string[]): string | undefined {
    const json = from.pop();
    if (json === undefined) return undefined;
    to.push(this.committed);
    this.trim();
    this.committed = json;
    return json;
  }

  /** Drops the oldest undo steps (then the farthest redo steps) past the count or size bound. */
  private trim(): void {
    while (this.past.length > HISTORY_LIMIT) this.past.shift();
    let chars = this.chars;
    while (chars > HISTORY_CHARS && this.past.length + this.future.length > 0) {
      const dropped = this.past.length > 0 ? this.past.shift() : this.future.shift();
      chars -= dropped?.length ?? 0;
    }
  }
}
