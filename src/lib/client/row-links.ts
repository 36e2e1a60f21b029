/**
 * Whole-row links for tables on a tablet: a row that opens a record carries `data-row-href`, and a tap anywhere
 * on it opens that record, while the row keeps its real link (the ref or name) for keyboards and screen readers.
 * The row does nothing when the tap lands on an inner link, button or field, or ends a text selection (so text
 * can still be selected and copied). Ctrl/Cmd-click and the middle button open a new tab, as a link would.
 * Installed once by the signed-in layout (src/layouts/AppLayout.astro).
 */

const INTERACTIVE = 'a, button, input, select, textarea, label, summary, [role="button"], [role="switch"], [contenteditable="true"]';

/** The record a click on a row should open, or null when the click belongs to something else. */
export function rowLinkFor(target: Element | null, selectedText: string): string | null {
  if (!target) return null;
  const row = target.closest('tr[data-row-href]');
  if (!row) return null;
  if (target.closest(INTERACTIVE)) return null;
  if (selectedText.trim() !== '') return null;
  return row.getAttribute('data-row-href') || null;
}

/** Document click/auxclick listener. */
export function followRowLink(e: MouseEvent): void {
  if (e.defaultPrevented || (e.button !== 0 && e.button !== 1)) return;
  const selection = window.getSelection();
  const href = rowLinkFor(e.target instanceof Element ? e.target : null, selection && !selection.isCollapsed ? selection.toString() : '');
  if (!href) return;
  if (e.button === 1 || e.ctrlKey || e.metaKey) window.open(href, '_blank', 'noopener');
  else window.location.assign(href);
}
