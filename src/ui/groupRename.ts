/**
 * A small rename control for a row of the Surfaces list: a "rename" button at the row's end; pressing it
 * turns the row's name into a text field holding the current label. Enter or leaving the field keeps the
 * text, Escape keeps the old label. An empty text gives the group its file name back.
 */

/**
 * Adds the control to `row` (a panel row whose name element is `.lil-name`); `current` is the label now,
 * `commit` gets the text typed (untrimmed) when it differs from `current`.
 */
export function addGroupRename(row: HTMLElement, current: string, commit: (label: string) => void): HTMLButtonElement {
  const button = document.createElement('button');
  button.type = 'button';
  button.className = 'group-rename';
  button.textContent = 'rename';
  button.title = 'rename this surface group (empty: its name in the file)';
  button.setAttribute('aria-label', `rename ${current}`);
  button.addEventListener('click', (ev) => {
    ev.stopPropagation();
    const name = row.querySelector<HTMLElement>('.lil-name');
    if (!name || name.querySelector('input')) return;
    const shown = name.textContent ?? '';
    const input = document.createElement('input');
    input.type = 'text';
    input.className = 'group-rename-input';
    input.value = current;
    input.setAttribute('aria-label', `new label for ${current}`);
    name.textContent = '';
    name.append(input);
    input.focus();
    input.select();
    let done = false;
    const finish = (keep: boolean) => {
      if (done) return;
      done = true;
      input.remove();
      name.textContent = shown;
      if (keep && input.value !== current) commit(input.value);
    };
    input.addEventListener('keydown', (e) => {
      // the study's shortcuts (Delete, Ctrl+Z …) must not act while a label is typed
      e.stopPropagation();
      if (e.key === 'Enter') finish(true);
      else if (e.key === 'Escape') finish(false);
    });
    input.addEventListener('click', (e) => e.stopPropagation());
    input.addEventListener('blur', () => finish(true));
  });
  row.append(button);
  return button;
}
