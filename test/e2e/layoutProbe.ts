/**
 * Measures the page's layout in the browser: per panel of the window, the visible interactive
 * and text boxes (HTML only: the 3D canvas, the SVG charts and the System view's body labels,
 * which follow the bodies and may meet by design, are left out) and two rules:
 *
 * - overlap: no two boxes of one panel, neither inside the other, share more than `tol` px in
 *   both directions (a sticky header and content scrolled beneath it excepted);
 * - horizontal overflow: no box reaches more than `tol` px beyond its panel's left or right edge
 *   or beyond an ancestor that clips it (overflow hidden/clip), unless an ancestor inside the
 *   panel scrolls sideways (overflow-x auto/scroll: the user can reach it); and the panel
 *   itself does not scroll sideways (scrollWidth ≤ clientWidth + tol);
 * - bleed: no box, chart or canvas reaches more than `tol` px above or below its panel into the
 *   next one unless an ancestor within the panel (or the panel) clips or scrolls vertically.
 *
 * `tol` covers sub-pixel rounding of fractional layout (1 px). The probe is plain JavaScript
 * source so the page runs exactly this text (no transpiler helpers).
 */
import type { Page } from 'playwright-core';

export interface LayoutProblem {
  panel: string;
  kind: 'overlap' | 'overflow' | 'bleed';
  /** Short descriptions of the boxes ("button 'Compute porkchop'"). */
  a: string;
  b?: string;
  /** Size of the overlap (the smaller side) or of the overflow, px. */
  px: number;
}

/** The window's panels: name and selector of their container. */
export const PANELS: readonly (readonly [string, string])[] = [
  ['top bar', '.topbar'],
  ['plan', 'aside.plan'],
  ['centre', '.centre > .screen:not(.hidden)'],
  ['right panel', 'aside.budget'],
  ['timeline', '.timeline'],
  ['status line', '.statusline'],
];

const PROBE = `(({ tol, panels }) => {
  const INTERACTIVE = 'input, select, button, textarea, a[href], [role=tab], [role=button]';
  const SKIP = 'svg, canvas, .scene-labels, [data-layout-skip]';
  const visible = (el) => {
    const r = el.getBoundingClientRect();
    if (r.width < 1 || r.height < 1) return false;
    for (let e = el; e; e = e.parentElement) {
      const s = getComputedStyle(e);
      if (s.display === 'none' || s.visibility === 'hidden' || s.visibility === 'collapse' || Number(s.opacity) === 0) return false;
    }
    return true;
  };
  const hasText = (el) => Array.from(el.childNodes).some((n) => n.nodeType === 3 && n.textContent.trim() !== '');
  const describe = (el) => {
    const t = (el.getAttribute('data-testid') || el.getAttribute('aria-label') || el.textContent || el.getAttribute('value') || '').trim().replace(/\\s+/g, ' ').slice(0, 40);
    const cls = typeof el.className === 'string' && el.className.trim() ? '.' + el.className.trim().split(/\\s+/).filter((c) => !c.startsWith('svelte-')).join('.') : '';
    return el.tagName.toLowerCase() + cls + (t ? " '" + t + "'" : '');
  };
  const stuck = (el) => {
    for (let e = el; e; e = e.parentElement) if (getComputedStyle(e).position === 'sticky') return e;
    return null;
  };
  const out = [];
  for (const [name, sel] of panels) {
    const panel = document.querySelector(sel);
    if (!panel || !visible(panel)) continue;
    const pr = panel.getBoundingClientRect();
    if (panel.scrollWidth > panel.clientWidth + tol) out.push({ panel: name, kind: 'overflow', a: 'the panel scrolls sideways', px: panel.scrollWidth - panel.clientWidth });
    const boxes = Array.from(panel.querySelectorAll('*')).filter(
      (el) => !el.closest(SKIP) && (el.matches(INTERACTIVE) || hasText(el)) && visible(el),
    );
    const rects = boxes.map((el) => el.getBoundingClientRect());
    // an inline box broken over lines is its line pieces, not their bounding rectangle
    const pieces = boxes.map((el) => Array.from(el.getClientRects()).filter((q) => q.width >= 1 && q.height >= 1));
    for (const el of panel.querySelectorAll('*')) {
      if (!(el.matches('svg, canvas') && !el.parentElement.closest('svg')) && !boxes.includes(el)) continue;
      if (!visible(el)) continue;
      let clipped = false;
      for (let e = el.parentElement; e; e = e.parentElement) {
        if (getComputedStyle(e).overflowY !== 'visible') { clipped = true; break; }
        if (e === panel) break;
      }
      if (clipped) continue;
      const r = el.getBoundingClientRect();
      const over = Math.max(r.bottom - pr.bottom, pr.top - r.top);
      if (over > tol) out.push({ panel: name, kind: 'bleed', a: describe(el), px: Math.round(over * 10) / 10 });
    }
    for (let i = 0; i < boxes.length; i++) {
      const el = boxes[i];
      const r = rects[i];
      // the nearest ancestor inside the panel that clips or scrolls sideways
      let bound = pr;
      let reachable = false;
      for (let e = el.parentElement; e && e !== panel; e = e.parentElement) {
        const ox = getComputedStyle(e).overflowX;
        if (ox === 'auto' || ox === 'scroll') { reachable = true; break; }
        if (ox === 'hidden' || ox === 'clip') { bound = e.getBoundingClientRect(); break; }
      }
      if (!reachable) {
        const over = Math.max(r.right - bound.right, bound.left - r.left);
        if (over > tol) out.push({ panel: name, kind: 'overflow', a: describe(el), px: Math.round(over * 10) / 10 });
      }
      for (let j = i + 1; j < boxes.length; j++) {
        const other = boxes[j];
        if (el.contains(other) || other.contains(el)) continue;
        // a sticky header over content scrolled beneath it is meant to cover it
        if (stuck(el) !== stuck(other)) continue;
        let worst = 0;
        for (const p of pieces[i])
          for (const q of pieces[j]) {
            const w = Math.min(p.right, q.right) - Math.max(p.left, q.left);
            const h = Math.min(p.bottom, q.bottom) - Math.max(p.top, q.top);
            if (w > tol && h > tol) worst = Math.max(worst, Math.min(w, h));
          }
        if (worst > 0) out.push({ panel: name, kind: 'overlap', a: describe(el), b: describe(other), px: Math.round(worst * 10) / 10 });
      }
    }
  }
  return out;
})`;

/** The layout problems of the page as it is now (see the rules above). */
export async function layoutProblems(page: Page, tol = 1): Promise<LayoutProblem[]> {
  return (await page.evaluate(`${PROBE}(${JSON.stringify({ tol, panels: PANELS })})`)) as LayoutProblem[];
}
