/**
 * The loading progress bar in the top bar: stage, bytes, and a cancel button (offered only while a
 * cancel can still keep the open file; once pressed it says so until the load ends).
 */
import { formatBytes } from './format.ts';

export class ProgressBar {
  private readonly el: HTMLDivElement;
  private readonly fill: HTMLDivElement;
  private readonly label: HTMLSpanElement;
  readonly cancel: HTMLButtonElement;

  constructor(host: HTMLElement) {
    this.el = document.createElement('div');
    this.el.className = 'progress';
    this.el.hidden = true;
    const track = document.createElement('div');
    track.className = 'progress-track';
    this.fill = document.createElement('div');
    this.fill.className = 'progress-fill';
    track.append(this.fill);
    this.label = document.createElement('span');
    this.label.className = 'progress-label';
    this.cancel = document.createElement('button');
    this.cancel.type = 'button';
    this.cancel.textContent = 'Cancel';
    this.cancel.className = 'progress-cancel';
    this.el.append(track, this.label, this.cancel);
    host.append(this.el);
  }

  /** Shows the stage and bytes done (a zero total shows the stage alone); `cancellable` offers Cancel. */
  show(stage: string, done: number, total: number, cancellable = true): void {
    this.el.hidden = false;
    this.cancel.hidden = !cancellable;
    const f = total > 0 ? Math.min(1, done / total) : 0;
    this.fill.style.width = `${(f * 100).toFixed(1)}%`;
    this.label.textContent = total > 0 ? `${stage} — ${formatBytes(done)} of ${formatBytes(total)}` : stage;
  }

  /** Marks a cancel as asked for (the button stays, disabled, until the load ends). */
  cancelling(): void {
    this.cancel.disabled = true;
    this.cancel.textContent = 'Cancelling…';
  }

  hide(): void {
    this.el.hidden = true;
    this.cancel.disabled = false;
    this.cancel.textContent = 'Cancel';
  }
}
