// Text hygiene shared by the request edge and the models.

/** The value with every U+0000 removed from its strings (object keys and nested values too). */
export function stripNul<T>(value: T): T {
  if (typeof value === "string") return (value.includes("\u0000") ? value.split("\u0000").join("") : value) as T;
  if (Array.isArray(value)) {
    let copy: unknown[] | null = null;
    for (let i = 0; i < value.length; i++) {
      const v = value[i];
      if (typeof v === "number") continue; // waveform arrays: skip the common case quickly
      const s = stripNul(v);
      if (s !== v) (copy ??= value.slice())[i] = s;
    }
    return (copy ?? value) as T;
  }
  if (value && typeof value === "object" && !(value instanceof Date) && !(value instanceof Uint8Array)) {
    let changed = false;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) {
      const key = stripNul(k);
      const s = stripNul(v);
      if (key !== k || s !== v) changed = true;
      out[key] = s;
    }
    return (changed ? out : value) as T;
  }
  return value;
}
