/**
 * Messages over the view: an error banner (a file that could not be read, a probe that failed), a
 * notice, and an in-page confirmation (used before loading a file larger than the memory it needs).
 * In-page rather than `window.confirm`, so the page keeps painting and tests can answer it.
 */

export class Banner {
  private readonly el: HTMLDivElement;

  /** `onChange` runs when the banner shows or hides (the view lays its pins out clear of it). */
  constructor(host: HTMLElement, private readonly onChange: () => void = () => {}) {
    this.el = document.createElement('div');
    this.el.className = 'banner';
    this.el.hidden = true;
    this.el.setAttribute('role', 'alert');
    host.append(this.el);
  }

  /** Shows an error until dismissed. */
  error(message: string): void { this.show('error', message); }

  /** Shows a notice until dismissed. */
  notice(message: string): void { this.show('notice', message); }

  clear(): void { this.el.hidden = true; this.el.replaceChildren(); this.onChange(); }

  /** Asks a yes/no question; resolves true when the user chooses `yes`. */
  confirm(message: string, yes: string, no: string): Promise<boolean> {
    return new Promise((resolve) => {
      this.show('warning', message, false);
      const bYes = button(yes, 'banner-yes'), bNo = button(no, 'banner-no');
      bYes.onclick = () => { this.clear(); resolve(true); };
      bNo.onclick = () => { this.clear(); resolve(false); };
      this.el.append(bYes, bNo);
    });
  }

  private show(kind: 'error' | 'notice' | 'warning', message: string, closable = true): void {
    this.el.hidden = false;
    this.el.dataset['kind'] = kind;
    const text = document.createElement('span');
    text.className = 'banner-text';
    text.textContent = message;
    this.el.replaceChildren(text);
    if (closable) {
      const close = button('Dismiss', 'banner-close');
      close.onclick = () => this.clear();
      this.el.append(close);
    }
    this.onChange();
  }
}

function button(label: string, cls: string): HTMLButtonElement {
  const b = document.createElement('button');
  b.type = 'button';
  b.className = cls;
  b.textContent = label;
  return b;
}
