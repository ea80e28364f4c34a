/**
 * The keys overlay: a small dialog listing the app's keyboard shortcuts (`src/app/shortcuts.ts` owns
 * them; this only shows the list it is given).
 */

/** One shortcut as the overlay lists it. */
export interface KeyHelp {
  /** Keys as shown, e.g. `Ctrl+Z`. */
  keys: string;
  what: string;
}

export class KeysOverlay {
  private readonly dialog: HTMLDialogElement;

  constructor(host: HTMLElement, keys: readonly KeyHelp[]) {
    this.dialog = document.createElement('dialog');
    this.dialog.className = 'keys';
    const h = document.createElement('h2');
    h.textContent = 'Keys';
    const table = document.createElement('table');
    for (const k of keys) {
      const tr = table.insertRow();
      const kd = document.createElement('kbd');
      kd.textContent = k.keys;
      tr.insertCell().append(kd);
      tr.insertCell().textContent = k.what;
    }
    const close = document.createElement('button');
    close.type = 'button';
    close.textContent = 'Close';
    close.onclick = () => this.dialog.close();
    this.dialog.append(h, table, close);
    host.append(this.dialog);
  }

  get isOpen(): boolean { return this.dialog.open; }
  toggle(): void { if (this.dialog.open) this.dialog.close(); else this.dialog.showModal(); }
}
