// Unsaved drafts kept in the browser, one per scenario: what is stored and when a stored draft
// is worth offering back. Pure (the caller passes a Storage-like object), no React.

export interface StoredDraft<T = unknown> {
  /** Version of the saved scenario the draft was edited from. */
  baseVersion: number;
  /** ISO time of the last edit. */
  savedAt: string;
  draft: T;
}

interface StorageLike {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

export const draftKey = (scenarioId: string) => `railwise:draft:${scenarioId}`;

export function writeDraft<T>(
  store: StorageLike,
  scenarioId: string,
  baseVersion: number,
  draft: T,
  now = new Date(),
): void {
  try {
    store.setItem(
      draftKey(scenarioId),
      JSON.stringify({ baseVersion, savedAt: now.toISOString(), draft } satisfies StoredDraft<T>),
    );
  } catch {
    // Storage full or disabled: the leave-page warning still protects the edit.
  }
}

export function clearDraft(store: StorageLike, scenarioId: string): void {
  try {
    store.removeItem(draftKey(scenarioId));
  } catch {
    // Nothing to clear when storage is disabled.
  }
}

/** The stored draft when it differs from what the server holds now; null otherwise (and a broken entry is dropped). */
export function readDraft<T>(store: StorageLike, scenarioId: string, current: T): StoredDraft<T> | null {
  let text: string | null = null;
  try {
    text = store.getItem(draftKey(scenarioId));
  } catch {
    return null;
  }
  if (!text) return null;
  try {
    const d = JSON.parse(text) as StoredDraft<T>;
    if (
      typeof d !== "object" ||
      d === null ||
      typeof d.baseVersion !== "number" ||
      typeof d.savedAt !== "string" ||
      d.draft === undefined
    )
      throw new Error("shape");
    if (JSON.stringify(d.draft) === JSON.stringify(current)) {
      clearDraft(store, scenarioId);
      return null;
    }
    return d;
  } catch {
    clearDraft(store, scenarioId);
    return null;
  }
}
