/**
 * The time bar of a series: step back/forward, a step slider, play/pause at a chosen rate (steps per
 * second) and a field to jump to a time. It only asks for steps (`onStep`); while a step is being shown
 * it never asks for the next one, so a slow step slows playback instead of piling requests up.
 */
import './series.css';

/** Playback rates offered (steps per second); the first is the default. */
export const PLAY_RATES = [2, 1, 5, 10, 25];

export interface TimeControlEvents {
  /** Show step `index`; resolves when it is shown (or failed: the bar then stops playing). */
  onStep: (index: number) => Promise<void>;
}

export class TimeControl {
  readonly el: HTMLDivElement;
  private readonly slider: HTMLInputElement;
  private readonly play: HTMLButtonElement;
  private readonly rate: HTMLSelectElement;
  private readonly jump: HTMLInputElement;
  private readonly readout: HTMLSpanElement;
  private times: number[] = [];
  private timeUnit = 's';
  private source = '';
  private current = 0;
  private playing = false;
  private busy = false;
  private wanted: number | null = null;

  constructor(host: HTMLElement, private readonly events: TimeControlEvents) {
    this.el = document.createElement('div');
    this.el.className = 'time-bar';
    this.el.hidden = true;
    const button = (text: string, title: string, cls: string) => {
      const b = document.createElement('button');
      b.type = 'button'; b.textContent = text; b.title = title; b.className = cls;
      return b;
    };
    const back = button('◀', 'Previous step', 'step-back');
    const fwd = button('▶', 'Next step', 'step-forward');
    this.play = button('Play', 'Play the steps at the chosen rate', 'play');
    back.onclick = () => this.go(this.current - 1);
    fwd.onclick = () => this.go(this.current + 1);
    this.play.onclick = () => (this.playing ? this.pause() : this.start());
    this.slider = document.createElement('input');
    this.slider.type = 'range'; this.slider.min = '0'; this.slider.step = '1'; this.slider.className = 'step-slider';
    this.slider.setAttribute('aria-label', 'Step');
    this.slider.oninput = () => this.go(Number(this.slider.value));
    this.rate = document.createElement('select');
    this.rate.className = 'play-rate';
    this.rate.title = 'Playback rate';
    for (const r of PLAY_RATES) this.rate.add(new Option(`${r} steps/s`, String(r)));
    this.jump = document.createElement('input');
    this.jump.type = 'text'; this.jump.className = 'jump-time'; this.jump.placeholder = 'go to time';
    this.jump.title = 'Type a time and press Enter: the step nearest to it is shown';
    this.jump.onkeydown = (e) => { if (e.key === 'Enter') this.jumpTo(this.jump.value); };
    this.readout = document.createElement('span');
    this.readout.className = 'step-readout';
    this.el.append(back, this.play, fwd, this.slider, this.readout, this.jump, this.rate);
    host.append(this.el);
  }

  /** Offers the steps of a series (`times` increasing, in `timeUnit`; `source` says where they came from). */
  setSteps(times: readonly number[], source: string, timeUnit = 's'): void {
    this.pause();
    this.times = [...times];
    this.source = source;
    this.timeUnit = timeUnit;
    this.el.hidden = times.length === 0;
    this.slider.max = String(Math.max(0, times.length - 1));
    this.current = 0;
    this.show(0);
  }

  /** Hides the bar (no series open). */
  clear(): void {
    this.setSteps([], '');
  }

  /** Index of the step shown. */
  get step(): number {
    return this.current;
  }

  get isPlaying(): boolean {
    return this.playing;
  }

  /** Index of the step whose time is nearest to `t`. */
  nearestStep(t: number): number {
    let best = 0;
    for (let i = 1; i < this.times.length; i++) if (Math.abs(this.times[i]! - t) < Math.abs(this.times[best]! - t)) best = i;
    return best;
  }

  /** Shows step `index` (clamped); a request made while a step is loading replaces any earlier waiting one. */
  go(index: number): void {
    if (this.times.length === 0) return;
    const i = Math.min(Math.max(Math.round(index), 0), this.times.length - 1);
    this.show(i);
    this.wanted = i;
    void this.drain();
  }

  start(): void {
    if (this.times.length < 2) return;
    if (this.current >= this.times.length - 1) this.go(0);
    this.playing = true;
    this.play.textContent = 'Pause';
    this.play.setAttribute('aria-pressed', 'true');
    void this.tick();
  }

  pause(): void {
    this.playing = false;
    this.play.textContent = 'Play';
    this.play.setAttribute('aria-pressed', 'false');
  }

  private jumpTo(text: string): void {
    const t = Number(text.trim().replace(',', '.').replace('−', '-'));
    if (!Number.isFinite(t) || this.times.length === 0) {
      this.jump.setCustomValidity('a time, e.g. 0.25');
      this.jump.reportValidity();
      return;
    }
    this.jump.setCustomValidity('');
    this.go(this.nearestStep(t));
  }

  private async tick(): Promise<void> {
    while (this.playing) {
      const started = performance.now();
      if (this.current >= this.times.length - 1) { this.pause(); return; }
      this.go(this.current + 1);
      await this.drain();
      const wait = 1000 / Number(this.rate.value) - (performance.now() - started);
      if (wait > 0) await new Promise((r) => setTimeout(r, wait));
    }
  }

  /** Loads the waiting step, one at a time. */
  private async drain(): Promise<void> {
    if (this.busy) { while (this.busy) await new Promise((r) => setTimeout(r, 10)); return; }
    this.busy = true;
    this.el.dataset['busy'] = 'true';
    try {
      while (this.wanted !== null) {
        const i = this.wanted;
        this.wanted = null;
        try {
          await this.events.onStep(i);
        } catch {
          this.pause();
        }
      }
    } finally {
      this.busy = false;
      this.el.dataset['busy'] = 'false';
    }
  }

  private show(i: number): void {
    this.current = i;
    this.slider.value = String(i);
    const n = this.times.length;
    this.el.dataset['step'] = String(i);
    this.readout.textContent = n ? `step ${i + 1} of ${n} · t = ${timeText(this.times[i]!)} ${this.timeUnit}${this.source ? ` (${this.source})` : ''}` : '';
  }
}

/** A step time as typed in a collection: up to 6 significant figures, no trailing zeros. */
function timeText(t: number): string {
  return String(Number(t.toPrecision(6))).replace('-', '−');
}
