/**
 * Statistics benchmark: transient detection, window statistics (with the uncertainty of the mean) and the
 * spectrum of one history on uneven steps, for 200, 2 000, 20 000 and 200 000 samples (a start-up transient,
 * a tone and noise). Reported per size: CPU time of each part (process.cpuUsage, ms, best of 3 runs) and the
 * spectrum's frequency count. Goal: a 20 000-step history summarised in under a second, so the app's chart
 * and the CLI report stay interactive. Alone: `node bin/run-ts.mjs bench/stats.bench.ts`.
 */
import { seededRandom } from '../src/model/seededRandom.ts';
import { dominantFrequency } from '../src/stats/spectrum.ts';
import { detectTransientEnd } from '../src/stats/transientStart.ts';
import { windowStatistics } from '../src/stats/windowStats.ts';

function history(n: number): { time: Float64Array; values: Float64Array } {
  const r = seededRandom(n);
  const time = new Float64Array(n), values = new Float64Array(n);
  let t = 0;
  for (let i = 0; i < n; i++) {
    time[i] = t;
    values[i] = 1 + 3 * Math.exp(-t / 5) + 0.4 * Math.sin(2 * Math.PI * 0.7 * t) + 0.1 * (r() - 0.5);
    t += (100 / n) * (0.5 + r());
  }
  return { time, values };
}

function cpuMs<T>(f: () => T): [number, T] {
  let best = Infinity, out!: T;
  for (let k = 0; k < 3; k++) {
    const c = process.cpuUsage();
    out = f();
    const d = process.cpuUsage(c);
    best = Math.min(best, (d.user + d.system) / 1000);
  }
  return [Math.round(best * 10) / 10, out];
}

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  for (const n of [200, 2_000, 20_000, 200_000]) {
    const { time, values } = history(n);
    const [transientMs, tr] = cpuMs(() => detectTransientEnd(time, values));
    const [statsMs] = cpuMs(() => windowStatistics(time, values, tr.time));
    const [spectrumMs, s] = cpuMs(() => dominantFrequency(time, values, tr.time));
    out[`samples${n}`] = { transientMs, statsMs, spectrumMs, totalMs: Math.round((transientMs + statsMs + spectrumMs) * 10) / 10, frequencies: s?.frequencies.length ?? 0, note: s?.note ?? null };
  }
  out.goals = '20 000 samples summarised (transient + statistics + spectrum) in < 1000 ms CPU';
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
