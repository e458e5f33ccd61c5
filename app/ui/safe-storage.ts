/** The browser's storage behind calls that never throw, and the words for why it refused. */
import { isQuotaError } from './saved-state';

/** The text of a caught error. */
export const errorText = (e: unknown): string => (e instanceof Error ? e.message : String(e));

/** The browser's storage, or null where even looking at it is refused (privacy settings). */
export function browserStorage(): Storage | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null;
  }
}

/** A Storage (or none) whose reads and writes report failures instead of throwing. */
export class SafeStorage {
  constructor(readonly storage: Storage | null) {}

  /** getItem that never throws: the text, null when absent, or the error. */
  read(key: string): string | null | { error: unknown } {
    try {
      return this.storage?.getItem(key) ?? null;
    } catch (e) {
      return { error: e };
    }
  }

  /** setItem that never throws: the error, or null when the value was stored. */
  write(key: string, value: string): unknown {
    if (!this.storage) return new Error('browser storage is not available');
    try {
      this.storage.setItem(key, value);
      return null;
    } catch (e) {
      return e ?? new Error('unknown storage error');
    }
  }

  /** removeItem that never throws. */
  remove(key: string): void {
    try {
      this.storage?.removeItem(key);
    } catch {
      // Nothing to do: the copy stays, which loses nothing.
    }
  }
}

/** Why a write failed, in words for a message. */
export function storageWhy(err: unknown): string {
  return isQuotaError(err)
    ? 'browser storage is full'
    : `the browser refused to store it (${errorText(err)})`;
}
