// Ordering of invalid fields for the "fix these fields first" list: in the order they appear
// on the page (document order), so focus lands on the topmost. Pure, no React.

export interface FieldProblemLike {
  label: string;
  message: string;
  inputId: string;
}

interface Positioned {
  compareDocumentPosition(other: Positioned): number;
}

const FOLLOWING = 4; // Node.DOCUMENT_POSITION_FOLLOWING

/** Problems in document order; fields whose element is missing go last, in label order. */
export function listFieldProblems<T extends FieldProblemLike>(
  problems: readonly T[],
  find: (id: string) => Positioned | null,
): T[] {
  const withEl = problems.map((p) => ({ p, el: find(p.inputId) }));
  return withEl
    .sort((a, b) => {
      if (a.el && b.el) return a.el === b.el ? 0 : a.el.compareDocumentPosition(b.el) & FOLLOWING ? -1 : 1;
      if (a.el) return -1;
      if (b.el) return 1;
      return a.p.label.localeCompare(b.p.label);
    })
    .map((x) => x.p);
}

/** "R ground: must be above 0; V+: not a value" — one line for a notice or a tooltip. */
export function describeFieldProblems(problems: readonly FieldProblemLike[]): string {
  return problems.map((p) => `${p.label}: ${p.message}`).join("; ");
}
