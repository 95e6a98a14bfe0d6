// Stable React keys for a list the user edits (the input's waveform components): each row keeps
// its id when a neighbour is removed or it moves, so its fields keep their own text. The ids live
// beside the list (the scenario JSON has no place for them). Pure, no React.

export interface RowIds {
  ids: number[];
  /** The id the next new row gets. */
  next: number;
}

export function seedRowIds(length: number, next = 1): RowIds {
  return { ids: Array.from({ length }, (_, k) => next + k), next: next + length };
}

/**
 * Ids for a list that changed length by some other way than the helpers below (a restored draft,
 * a design applied): rows added at the end get new ids; a shorter list gets new ids for all,
 * since it is not known which rows went.
 */
export function fitRowIds(r: RowIds, length: number): RowIds {
  if (r.ids.length === length) return r;
  if (length > r.ids.length) {
    const added = seedRowIds(length - r.ids.length, r.next);
    return { ids: [...r.ids, ...added.ids], next: added.next };
  }
  return seedRowIds(length, r.next);
}

export function addRowId(r: RowIds): RowIds {
  return { ids: [...r.ids, r.next], next: r.next + 1 };
}

export function removeRowId(r: RowIds, index: number): RowIds {
  return { ids: r.ids.filter((_, k) => k !== index), next: r.next };
}

/** Swap row `index` with row `to` (the ↑/↓ buttons move by one). */
export function swapRowIds(r: RowIds, index: number, to: number): RowIds {
  if (to < 0 || to >= r.ids.length || index < 0 || index >= r.ids.length) return r;
  const ids = [...r.ids];
  [ids[index], ids[to]] = [ids[to], ids[index]];
  return { ids, next: r.next };
}

/**
 * Keys for a list that is only shown, never edited: its content, with "#2", "#3" … on a
 * repeated entry so equal rows (two columns both named "volts") still get distinct keys.
 */
export function contentKeys<T>(items: readonly T[], text: (item: T, index: number) => string = String): string[] {
  const seen = new Map<string, number>();
  return items.map((item, index) => {
    const t = text(item, index);
    const n = (seen.get(t) ?? 0) + 1;
    seen.set(t, n);
    return n === 1 ? t : `${t}#${n}`;
  });
}
