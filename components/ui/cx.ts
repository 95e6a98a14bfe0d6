/** Join class names, skipping falsy parts (a tiny stand-in for clsx; keeps the UI kit dependency-free). */
export function cx(...parts: Array<string | false | null | undefined>): string {
  return parts.filter(Boolean).join(" ");
}
