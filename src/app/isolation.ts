/**
 * Cross-origin isolation for a page served without the COOP/COEP headers (a plain static server of dist/):
 * registers public/isolation-sw.js, which adds them, and reloads once so the page comes back under it. The
 * dev and preview servers send the headers themselves (vite.config.ts). Where service workers are not
 * available (a page opened from a file, a browser without them) the app runs with one compute worker and
 * the about box says so (src/parallel/poolPlan.ts).
 */

const RELOADED = 'fieldtally:isolation-reload';

/**
 * Resolves when the app may start. When a reload is on its way it never resolves (the page is replaced).
 * Reloads at most once per tab session, so a browser that refuses the worker cannot loop.
 */
export async function ensureIsolation(): Promise<void> {
  if (globalThis.crossOriginIsolated || !window.isSecureContext || !('serviceWorker' in navigator)) return;
  let reg: ServiceWorkerRegistration;
  try {
    reg = await navigator.serviceWorker.register(new URL('./isolation-sw.js', document.baseURI).href);
  } catch (e) {
    console.warn('fieldtally: no service worker for cross-origin isolation; computing with one worker', e);
    return;
  }
  if (sessionStorage.getItem(RELOADED)) return;
  const worker = reg.installing ?? reg.waiting ?? reg.active;
  if (!worker) return;
  sessionStorage.setItem(RELOADED, '1');
  if (navigator.serviceWorker.controller) { location.reload(); return new Promise(() => {}); }
  await new Promise<void>((resolve) => {
    navigator.serviceWorker.addEventListener('controllerchange', () => resolve(), { once: true });
    if (worker.state === 'activated') resolve();
  });
  location.reload();
  return new Promise(() => {});
}
