/**
 * Pins: each probe's key numbers in a small box beside the geometry, tied to the probe's anchor by a
 * leader line. The overlay follows the camera (re-laid out after every frame) and the same layout and
 * drawing serve the PNG export (`drawPins`).
 */
import { notesText } from './notes.ts';
import { edgeAnchor, layoutPins, leaderEnd, type PinBox, type PlacedPin, type Rect } from './pinLayout.ts';
import type { ProbeResult } from './results.ts';
import { quantityText } from './roundingNoise.ts';

/** Pin colours (also looked for in exported pictures by the browser test). */
export const PIN_STYLE = {
  border: '#1d4ed8',
  leader: '#1d4ed8',
  background: 'rgba(255,255,255,0.94)',
  title: '#1d4ed8',
  text: '#111827',
  font: '12px system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif',
  titleFont: '600 12px system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif',
  lineHeight: 16,
  padding: 6,
} as const;

/** Screen position of a world point, as the view computes it. */
export type Projector = (p: [number, number, number]) => { x: number; y: number; behind: boolean };

/** Text lines of a pin: title, then `label = value unit` per pinned quantity, rounding noise marked (or the notes). */
export function pinLines(r: ProbeResult): { title: string; rows: { key: string; text: string }[] } {
  const rows = r.quantities.filter((q) => q.pinned).map((q) => ({ key: q.key, text: `${q.label} = ${quantityText(q)}` }));
  // a long note (a failure's message) is cut on the pin; the table shows it whole
  const note = notesText(r.notes);
  if (rows.length === 0 && note) rows.push({ key: 'note', text: note.length > 90 ? `${note.slice(0, 89)}…` : note });
  if (r.tag) rows.push({ key: 'tag', text: r.tag });
  return { title: r.label, rows };
}

/** The DOM overlay of pins over the view. */
export class PinOverlay {
  private readonly svg: SVGSVGElement;
  private readonly boxes = new Map<string, { el: HTMLDivElement; width: number; height: number }>();
  private results: ProbeResult[] = [];

  private selected: string | undefined;
  /** Pins placed by hand: box corner relative to the anchor (CSS pixels), by probe id. */
  offsets = new Map<string, [number, number]>();
  /** Where each pin is now (for a drag's start). */
  private placedNow = new Map<string, PlacedPin>();

  /**
   * `onPick`: a pin was clicked (its probe becomes the selected one); `onMoved`: a pin was dragged to a new
   * place (offset from its anchor, CSS pixels), to be kept with the probe.
   */
  constructor(private readonly host: HTMLElement, private readonly project: Projector, private readonly onPick?: (id: string) => void,
    private readonly onMoved?: (id: string, offset: [number, number]) => void) {
    this.svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    this.svg.classList.add('pin-leaders');
    host.append(this.svg);
  }

  /** Replaces the pins' content (after a probe is computed, hidden or removed). */
  setResults(results: readonly ProbeResult[]): void {
    this.results = results.filter((r) => r.pinVisible);
    const keep = new Set(this.results.map((r) => r.id));
    for (const [id, b] of this.boxes) if (!keep.has(id)) { b.el.remove(); this.boxes.delete(id); }
    for (const r of this.results) {
      let b = this.boxes.get(r.id);
      if (!b) {
        const el = document.createElement('div');
        el.className = 'pin';
        el.dataset['pin'] = r.id;
        const id = r.id;
        el.addEventListener('pointerdown', (ev) => this.drag(ev, id, el));
        this.host.append(el);
        b = { el, width: 0, height: 0 };
        this.boxes.set(r.id, b);
      }
      const { title, rows } = pinLines(r);
      b.el.replaceChildren();
      b.el.classList.toggle('selected', r.id === this.selected);
      const t = document.createElement('div');
      t.className = 'pin-title';
      t.textContent = title;
      b.el.append(t);
      for (const row of rows) {
        const d = document.createElement('div');
        d.className = 'pin-row';
        d.dataset['quantity'] = row.key;
        d.textContent = row.text;
        b.el.append(d);
      }
      // measured once per content change, not per frame
      b.width = b.el.offsetWidth;
      b.height = b.el.offsetHeight;
    }
    this.update();
  }

  /** Marks the selected probe's pin. */
  setSelected(id: string | undefined): void {
    this.selected = id;
    for (const [k, b] of this.boxes) b.el.classList.toggle('selected', k === id);
  }

  /** Re-projects anchors and re-lays out the boxes (call after each rendered frame). */
  update(): void {
    const w = this.host.clientWidth, h = this.host.clientHeight;
    const boxes: PinBox[] = [];
    const edges = new Map<string, [number, number]>();
    for (const r of this.results) {
      const b = this.boxes.get(r.id)!;
      const p = this.project(r.anchor);
      b.el.style.display = p.behind ? 'none' : '';
      if (p.behind) continue;
      // an anchor off the view: the pin points to a marker on the edge, towards it
      const e = edgeAnchor(p.x, p.y, w, h);
      if (e.dir) edges.set(r.id, e.dir);
      boxes.push({ id: r.id, anchorX: e.x, anchorY: e.y, width: b.width, height: b.height });
    }
    for (const b of boxes) { const off = this.offsets.get(b.id); if (off) b.offset = off; }
    // no pins, no layout work (and no forced style pass for the obstacles) in this frame
    const placed = boxes.length ? layoutPins(boxes, w, h, { obstacles: this.obstacles() }) : [];
    this.placedNow = new Map(placed.map((p) => [p.id, p]));
    this.svg.setAttribute('width', String(w));
    this.svg.setAttribute('height', String(h));
    const parts: string[] = [];
    for (const p of placed) {
      const b = this.boxes.get(p.id)!;
      b.el.style.transform = `translate(${Math.round(p.x)}px, ${Math.round(p.y)}px)`;
      const [ex, ey] = leaderEnd(p);
      parts.push(`<line x1="${p.anchorX}" y1="${p.anchorY}" x2="${ex}" y2="${ey}" stroke="${PIN_STYLE.leader}" stroke-width="1.5"/>`);
      const dir = edges.get(p.id);
      if (dir) parts.push(`<polygon class="edge-marker" data-pin-edge="${p.id}" points="${edgeMarker(p.anchorX, p.anchorY, dir, 1)}" fill="${PIN_STYLE.leader}" stroke="white" stroke-width="1"/>`);
      else parts.push(`<circle cx="${p.anchorX}" cy="${p.anchorY}" r="3.5" fill="${PIN_STYLE.leader}" stroke="white" stroke-width="1"/>`);
    }
    this.svg.innerHTML = parts.join('');
  }

  /**
   * Drags a pin by hand (the leader follows); a press without movement is a click (selects the probe).
   * Page text is not selected meanwhile.
   */
  private drag(ev: PointerEvent, id: string, el: HTMLElement): void {
    if (ev.button !== 0) return;
    ev.preventDefault();
    const start = this.placedNow.get(id);
    if (!start) return;
    const x0 = ev.clientX, y0 = ev.clientY;
    let moved = false;
    el.setPointerCapture(ev.pointerId);
    const move = (e: PointerEvent) => {
      if (!moved && Math.hypot(e.clientX - x0, e.clientY - y0) < 4) return;
      moved = true;
      this.offsets.set(id, [start.x - start.anchorX + e.clientX - x0, start.y - start.anchorY + e.clientY - y0]);
      this.update();
    };
    const up = () => {
      el.removeEventListener('pointermove', move);
      el.removeEventListener('pointerup', up);
      el.removeEventListener('pointercancel', up);
      if (!moved) { this.onPick?.(id); return; }
      const p = this.placedNow.get(id)!;
      // the kept offset is where the pin ended (inside the view)
      const off: [number, number] = [Math.round(p.x - p.anchorX), Math.round(p.y - p.anchorY)];
      this.offsets.set(id, off);
      this.onMoved?.(id, off);
    };
    el.addEventListener('pointermove', move);
    el.addEventListener('pointerup', up);
    el.addEventListener('pointercancel', up);
  }

  /** What pins keep clear of on screen: the legend, the view's buttons, the axis triad and a shown banner (pixels of the overlay). */
  private obstacles(): Rect[] {
    const o = this.host.getBoundingClientRect();
    const out: Rect[] = [];
    for (const el of this.host.parentElement?.querySelectorAll<HTMLElement>('.legend, .view-tools, .axis-triad-view, .banner:not([hidden])') ?? []) {
      const r = el.getBoundingClientRect();
      if (r.width > 0 && r.height > 0) out.push({ x: r.left - o.left, y: r.top - o.top, width: r.width, height: r.height });
    }
    return out;
  }
}

/** A small arrowhead at (x, y) pointing along `dir` (unit), as SVG polygon points; `scale` sizes it. */
function edgeMarker(x: number, y: number, dir: [number, number], scale: number): string {
  const [dx, dy] = dir, L = 11 * scale, W = 6 * scale;
  const tip = [x + dx * L / 2, y + dy * L / 2], back = [x - dx * L / 2, y - dy * L / 2];
  const a = [back[0]! - dy * W, back[1]! + dx * W], b = [back[0]! + dy * W, back[1]! - dx * W];
  return [tip, a, b].map((q) => `${q[0]!.toFixed(1)},${q[1]!.toFixed(1)}`).join(' ');
}

/** Measures a pin's box for canvas drawing at `scale` (device pixels per CSS pixel). */
function measure(ctx: CanvasRenderingContext2D, r: ProbeResult, scale: number): { width: number; height: number } {
  const { title, rows } = pinLines(r);
  ctx.font = PIN_STYLE.titleFont;
  let w = ctx.measureText(title).width;
  ctx.font = PIN_STYLE.font;
  for (const row of rows) w = Math.max(w, ctx.measureText(row.text).width);
  return { width: (w + 2 * PIN_STYLE.padding) * scale, height: ((rows.length + 1) * PIN_STYLE.lineHeight + 2 * PIN_STYLE.padding) * scale };
}

/**
 * Draws the pins with their leader lines onto an exported picture. `project` maps world points to
 * pixels of the picture; `scale` sizes text so the picture reads like the screen at its resolution;
 * `obstacles` (the legend, the footer) are kept clear; off-picture anchors are marked above the lowest
 * `bottomReserve` pixels (the footer band); pins placed by hand keep their `offsets` (CSS pixels, scaled).
 * Returns where each pin went (the browser test looks for pin pixels there).
 */
export function drawPins(ctx: CanvasRenderingContext2D, results: readonly ProbeResult[], project: Projector, scale: number, obstacles: readonly Rect[] = [],
  bottomReserve = 0, offsets: ReadonlyMap<string, [number, number]> = new Map()): PlacedPin[] {
  const shown = results.filter((r) => r.pinVisible);
  const boxes: PinBox[] = [];
  const edges = new Map<string, [number, number]>();
  const W = ctx.canvas.width, H = ctx.canvas.height;
  ctx.save();
  for (const r of shown) {
    const p = project(r.anchor);
    if (p.behind) continue;
    const m = measure(ctx, r, 1);
    // an off-picture anchor is marked above the footer band, so its leader never crosses the footer's text
    const inView = p.x >= 0 && p.x <= W && p.y >= 0 && p.y <= H;
    const e = inView ? { x: p.x, y: p.y, dir: null } : edgeAnchor(p.x, p.y, W, H - bottomReserve, 10 * scale);
    if (e.dir) edges.set(r.id, e.dir);
    const off = offsets.get(r.id);
    boxes.push({ id: r.id, anchorX: e.x, anchorY: e.y, width: m.width * scale, height: m.height * scale, ...(off ? { offset: [off[0] * scale, off[1] * scale] as [number, number] } : {}) });
  }
  const placed = layoutPins(boxes, W, H, { offset: 28 * scale, gap: 6 * scale, margin: 8 * scale, obstacles });
  for (const p of placed) {
    const r = shown.find((x) => x.id === p.id)!;
    const [ex, ey] = leaderEnd(p);
    ctx.strokeStyle = PIN_STYLE.leader;
    ctx.lineWidth = 1.5 * scale;
    ctx.beginPath(); ctx.moveTo(p.anchorX, p.anchorY); ctx.lineTo(ex, ey); ctx.stroke();
    ctx.fillStyle = PIN_STYLE.leader;
    const dir = edges.get(p.id);
    if (dir) {
      const pts = edgeMarker(p.anchorX, p.anchorY, dir, scale).split(' ').map((q) => q.split(',').map(Number));
      ctx.beginPath(); ctx.moveTo(pts[0]![0]!, pts[0]![1]!); ctx.lineTo(pts[1]![0]!, pts[1]![1]!); ctx.lineTo(pts[2]![0]!, pts[2]![1]!); ctx.closePath(); ctx.fill();
    } else {
      ctx.beginPath(); ctx.arc(p.anchorX, p.anchorY, 3.5 * scale, 0, 2 * Math.PI); ctx.fill();
    }
    ctx.fillStyle = PIN_STYLE.background;
    ctx.fillRect(p.x, p.y, p.width, p.height);
    ctx.strokeStyle = PIN_STYLE.border;
    ctx.lineWidth = 1.5 * scale;
    ctx.strokeRect(p.x, p.y, p.width, p.height);
    const { title, rows } = pinLines(r);
    ctx.textBaseline = 'top';
    const x = p.x + PIN_STYLE.padding * scale;
    let y = p.y + PIN_STYLE.padding * scale + 2 * scale;
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.font = PIN_STYLE.titleFont.replace('12px', `${12 * scale}px`);
    ctx.fillStyle = PIN_STYLE.title;
    ctx.fillText(title, x, y);
    ctx.font = PIN_STYLE.font.replace('12px', `${12 * scale}px`);
    ctx.fillStyle = PIN_STYLE.text;
    for (const row of rows) { y += PIN_STYLE.lineHeight * scale; ctx.fillText(row.text, x, y); }
  }
  ctx.restore();
  return placed;
}
