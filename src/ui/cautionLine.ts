/**
 * The caution on the working screens: a short strip at the foot of the results pane and of the chart,
 * with the same text as every export and the about box (`caution.ts`). Two lines at most; a click shows
 * it whole (the full text is in the element either way, and in its tooltip).
 */
import { CAUTION } from './caution.ts';

/** Appends the caution strip to `host` (a pane) and returns it. */
export function addCautionLine(host: HTMLElement): HTMLElement {
  const el = document.createElement('div');
  el.className = 'caution-line';
  el.title = `Caution: ${CAUTION}`;
  // the clamp sits on an inner element: the strip's padding would show a third line's top
  const text = document.createElement('div');
  const b = document.createElement('b');
  b.textContent = 'Caution: ';
  text.append(b, CAUTION);
  el.append(text);
  el.onclick = () => el.classList.toggle('whole');
  host.append(el);
  return el;
}
