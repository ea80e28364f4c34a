/**
 * How long the page's main thread waited for a CPU while a browser test ran: Linux counts, per thread, the
 * time it was ready to run but another process held the CPU (run-queue delay, second field of
 * `/proc/<pid>/task/<tid>/schedstat`, ns). Sampled from the test process every few ms, it lets a long task be
 * judged by the time it held the main thread (running our code or blocked waiting, e.g. for the GPU process)
 * rather than by time the machine's other work took from it: on a loaded machine a 40 ms task can last 120 ms.
 * The waiting counted for a task is only what falls between two samples inside the task, so it never exceeds
 * the truth: a task that held the thread for over the limit is always caught.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';

interface Sample { at: number; ran: number; waited: number }

/** Epoch ms and run-queue delay (ms) of each renderer's main thread (its pid), sampled every `everyMs`. */
export class RunQueueWatch {
  private readonly samples = new Map<number, Sample[]>();
  private renderers: number[] = [];
  private lastScan = 0;
  private readonly timer: ReturnType<typeof setInterval>;

  constructor(private readonly owner = process.pid, everyMs = 10) {
    this.timer = setInterval(() => this.sample(), everyMs);
  }

  /** Whether this system reports run-queue delays (Linux with scheduler statistics). */
  static get available(): boolean { return existsSync('/proc/self/schedstat'); }

  stop(): void { clearInterval(this.timer); }

  private sample(): void {
    const now = Date.now();
    if (now - this.lastScan > 500) { this.renderers = rendererPids(this.owner); this.lastScan = now; }
    for (const pid of this.renderers) {
      try {
        const [ran, waited] = readFileSync(`/proc/${pid}/task/${pid}/schedstat`, 'utf8').split(' ').map((x) => Number(x) / 1e6) as [number, number];
        let list = this.samples.get(pid);
        if (!list) this.samples.set(pid, list = []);
        list.push({ at: now, ran, waited });
      } catch { /* the renderer ended */ }
    }
  }

  /**
   * Milliseconds the busiest renderer's main thread waited for a CPU between the first and last samples taken
   * within [from, to] (epoch ms); 0 with fewer than two samples there.
   */
  waitedWithin(from: number, to: number): number { return this.within(from, to).waited; }

  /** Milliseconds run and waited for a CPU between the first and last samples within [from, to] (see `waitedWithin`). */
  private within(from: number, to: number): { ran: number; waited: number } {
    const pid = busiest([...this.samples.keys()]);
    const inside = (pid === undefined ? [] : this.samples.get(pid)!).filter((s) => s.at >= from && s.at <= to);
    if (inside.length < 2) return { ran: 0, waited: 0 };
    return { ran: inside.at(-1)!.ran - inside[0]!.ran, waited: inside.at(-1)!.waited - inside[0]!.waited };
  }

  /**
   * Of long tasks (page clock: `start` ms after `timeOrigin`, `duration` ms), those that held the main thread
   * for more than `limitMs` once the waiting for a CPU inside them is taken off; each with `heldMs` and, of
   * that, `ranMs` sampled as running (the rest was blocked, e.g. waiting for the GPU process).
   */
  heldOver<T extends { start: number; duration: number }>(tasks: T[], timeOrigin: number, limitMs: number): (T & { heldMs: number; ranMs: number })[] {
    return tasks
      .map((t) => {
        const w = this.within(timeOrigin + t.start, timeOrigin + t.start + t.duration);
        return { ...t, heldMs: Math.round(t.duration - w.waited), ranMs: Math.round(w.ran) };
      })
      .filter((t) => t.heldMs > limitMs);
  }
}

/** Renderer processes among the descendants of `owner` (the browser this test launched). */
function rendererPids(owner: number): number[] {
  const parent = new Map<number, number>(), out: number[] = [];
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      parent.set(Number(name), Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]));
    } catch { /* ended meanwhile */ }
  }
  for (const pid of parent.keys()) {
    let mine = false;
    for (let p = parent.get(pid); p !== undefined && p > 1; p = parent.get(p)) if (p === owner) { mine = true; break; }
    if (!mine) continue;
    try { if (readFileSync(`/proc/${pid}/cmdline`, 'utf8').includes('--type=renderer')) out.push(pid); } catch { /* ended */ }
  }
  return out;
}

/** The renderer whose main thread used the most CPU (the app's page, not a spare renderer). */
function busiest(pids: number[]): number | undefined {
  let best: number | undefined, most = -1;
  for (const pid of pids) {
    try {
      const f = readFileSync(`/proc/${pid}/task/${pid}/stat`, 'utf8');
      const g = f.slice(f.lastIndexOf(')') + 2).split(' ');
      const t = Number(g[11]) + Number(g[12]);
      if (t > most) { most = t; best = pid; }
    } catch { /* ended */ }
  }
  return best;
}
