// Layout measurements run inside the page (shared by the layout e2e files): text cut off by its
// box, drop-downs too narrow for their chosen words, the page scrolling sideways, and where the
// header's and the page's content edges sit.
import type { Page } from "playwright-core";

/** Text elements inside `selector` whose content is wider than their box (cut off or ellipsised). */
export async function clipped(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const out: string[] = [];
    for (const root of Array.from(document.querySelectorAll(sel))) {
      for (const el of Array.from(
        root.querySelectorAll<HTMLElement>("span, td, th, label, p, h1, h2, h3, option, button, a"),
      )) {
        if (el.offsetParent === null) continue; // hidden
        // Visually hidden on purpose (screen-reader text, 1 × 1 px and clipped).
        if (el.clientWidth <= 1 && el.clientHeight <= 1) continue;
        const cs = getComputedStyle(el);
        const clips = cs.overflowX === "hidden" || cs.overflowX === "clip" || cs.textOverflow === "ellipsis";
        if (!clips) continue;
        if (el.scrollWidth > el.clientWidth + 1 && (el.textContent ?? "").trim())
          out.push(
            `${el.tagName.toLowerCase()}: "${(el.textContent ?? "").trim().slice(0, 60)}" (${el.scrollWidth} > ${el.clientWidth})`,
          );
      }
    }
    return out;
  }, selector);
}

/** Drop-down lists inside `selector` whose chosen option's words are wider than the list shows. */
export async function cutSelects(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const out: string[] = [];
    const ctx = document.createElement("canvas").getContext("2d")!;
    for (const root of Array.from(document.querySelectorAll(sel))) {
      for (const el of Array.from(root.querySelectorAll<HTMLSelectElement>("select"))) {
        if (el.offsetParent === null) continue;
        const text = el.selectedOptions[0]?.text ?? "";
        const cs = getComputedStyle(el);
        ctx.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
        // The box minus its padding and the arrow (about 20 px in Chromium).
        const room = el.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight) - 20;
        if (ctx.measureText(text).width > room + 1)
          out.push(`select: "${text}" (${Math.round(ctx.measureText(text).width)} > ${Math.round(room)})`);
      }
    }
    return out;
  }, selector);
}

/** How far the page is wider than the window (0 when it does not scroll sideways). */
export async function sidewaysOverflow(page: Page): Promise<number> {
  return page.evaluate(() => Math.max(0, document.documentElement.scrollWidth - document.documentElement.clientWidth));
}

export interface Edges {
  left: number;
  right: number;
}

/** The content edges (box minus padding) of the first element matching `selector`, or null. */
export async function contentEdges(page: Page, selector: string): Promise<Edges | null> {
  return page.evaluate((sel) => {
    const el = document.querySelector<HTMLElement>(sel);
    if (!el || el.offsetParent === null) return null;
    const r = el.getBoundingClientRect();
    const cs = getComputedStyle(el);
    return {
      left: Math.round(r.left + parseFloat(cs.paddingLeft)),
      right: Math.round(r.right - parseFloat(cs.paddingRight)),
    };
  }, selector);
}

/** The outer edges of the widest visible child of `selector` (what the page actually spans). */
export async function spanOfChildren(page: Page, selector: string): Promise<Edges | null> {
  return page.evaluate((sel) => {
    const root = document.querySelector<HTMLElement>(sel);
    if (!root) return null;
    let left = Infinity;
    let right = -Infinity;
    for (const el of Array.from(root.children) as HTMLElement[]) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      left = Math.min(left, r.left);
      right = Math.max(right, r.right);
    }
    return Number.isFinite(left) ? { left: Math.round(left), right: Math.round(right) } : null;
  }, selector);
}

/**
 * Grid holes: for every CSS grid inside `selector` with two or more columns, the cells left empty
 * in a row that has an item in it (an orphan card beside nothing). Answers one line per hole.
 */
export async function gridHoles(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const out: string[] = [];
    const root = document.querySelector(sel);
    if (!root) return out;
    for (const grid of [root, ...Array.from(root.querySelectorAll("*"))] as HTMLElement[]) {
      const cs = getComputedStyle(grid);
      if (cs.display !== "grid" || grid.offsetParent === null) continue;
      const columns = cs.gridTemplateColumns.split(" ").filter(Boolean).length;
      if (columns < 2) continue;
      const items = (Array.from(grid.children) as HTMLElement[]).filter((c) => c.getBoundingClientRect().height > 0);
      // Rows by the items' top edges; a row's width used is the sum of its items' widths.
      const rows = new Map<number, number>();
      for (const c of items) {
        const r = c.getBoundingClientRect();
        const top = Math.round(r.top);
        rows.set(top, (rows.get(top) ?? 0) + r.width);
      }
      const inner = grid.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight);
      const gap = parseFloat(cs.columnGap) || 0;
      const column = (inner - gap * (columns - 1)) / columns;
      for (const [top, used] of rows) {
        const empty = inner - used - gap * (columns - 1);
        if (empty > column * 0.5) {
          const name = grid.getAttribute("data-testid") ?? grid.className.slice(0, 40);
          out.push(`grid "${name}" row at ${top}px: ${Math.round(empty)} px of ${Math.round(inner)} empty`);
        }
      }
    }
    return out;
  }, selector);
}

/** Tables inside `selector` that are wider than their box (a sideways scroll inside a card). */
export async function scrollingTables(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const out: string[] = [];
    for (const table of Array.from(document.querySelectorAll<HTMLTableElement>(`${sel} table`))) {
      const box = table.parentElement;
      if (!box || table.offsetParent === null) continue;
      if (box.scrollWidth > box.clientWidth + 1) {
        const name = table.getAttribute("aria-label") ?? table.getAttribute("data-testid") ?? "table";
        out.push(`table "${name}" is ${box.scrollWidth} px wide in a ${box.clientWidth} px box`);
      }
    }
    return out;
  }, selector);
}

/**
 * Controls and words that stick out past the right edge of the card (section) they belong to:
 * a row that does not wrap on a narrow screen. Elements inside a sideways-scrolling box are left
 * to scrollingTables.
 */
export async function spillsOut(page: Page, selector: string): Promise<string[]> {
  // Through a locator, so Playwright selectors (section:has(h2:text-is('Trace'))) work too.
  return page.locator(selector).evaluateAll((cards) => {
    const out: string[] = [];
    for (const card of cards as HTMLElement[]) {
      const edge = card.getBoundingClientRect().right;
      for (const el of Array.from(
        card.querySelectorAll<HTMLElement>("button, a, span, label, input, select, textarea, p, h2, h3"),
      )) {
        if (el.offsetParent === null) continue;
        const r = el.getBoundingClientRect();
        if (r.width === 0 || r.right <= edge + 1) continue;
        let scroller = el.parentElement;
        while (scroller && scroller !== card && getComputedStyle(scroller).overflowX === "visible")
          scroller = scroller.parentElement;
        if (scroller && scroller !== card) continue;
        const name = card.querySelector("h2")?.textContent ?? card.getAttribute("aria-label") ?? "card";
        out.push(
          `${el.tagName.toLowerCase()} "${(el.textContent ?? "").trim().slice(0, 40)}" sticks ${Math.round(r.right - edge)} px out of "${name}"`,
        );
      }
    }
    return out;
  });
}
