/**
 * Exports: a picture of the view at a chosen resolution with the legend and pins drawn in, the results
 * as CSV and JSON, and the results as text on the clipboard. Every export carries the caution.
 */
import type GUI from 'lil-gui';
import * as THREE from 'three';
import { CAUTION } from '../study/caution.ts';
import { download } from '../ui/download.ts';
import { drawTriad } from '../ui/axisTriad.ts';
import { drawLegend } from '../ui/legend.ts';
import { drawPins } from '../ui/pins.ts';
import { resultsAsCsv, resultsAsJson, resultsAsText, type ExportContext } from '../ui/results.ts';
import type { Viewer } from './viewer.ts';

/** Largest picture side offered (pixels): a 4K frame. */
const MAX_SIDE = 4096;

export class ExportTool {
  private readonly size = { width: 1920, height: 1080 };

  constructor(private readonly v: Viewer, gui: GUI) {
    const f = gui.addFolder('Export');
    f.add(this.size, 'width', 320, MAX_SIDE, 1).name('picture width [px]');
    f.add(this.size, 'height', 240, MAX_SIDE, 1).name('picture height [px]');
    f.add({ png: () => void this.track(this.png()) }, 'png').name('save picture (PNG)');
    f.add({ csv: () => this.csv() }, 'csv').name('save results (CSV)');
    f.add({ json: () => this.json() }, 'json').name('save results (JSON)');
    v.on('copy', () => void this.copy());
  }

  /** Pixel size `picture()` renders at (clamped as there). */
  get pictureSize(): { width: number; height: number } {
    return {
      width: Math.round(Math.min(MAX_SIDE, Math.max(16, this.size.width))),
      height: Math.round(Math.min(MAX_SIDE, Math.max(16, this.size.height))),
    };
  }

  private track(p: Promise<void>): Promise<void> {
    return this.v.track(p).catch((e) => this.v.banner.error(`Export: ${(e as Error).message}`));
  }

  private context(): ExportContext {
    return { tool: 'fieldtally', file: this.v.description?.report.source ?? '(no file)', createdAt: new Date().toISOString() };
  }

  private baseName(): string {
    return (this.v.description?.report.source ?? 'fieldtally').replace(/\.[^.]+$/, '');
  }

  /** Renders the picture: scene offscreen at the chosen size, then legend, pins and the caution line on a 2D canvas. */
  async picture(): Promise<Blob> {
    const { width: w, height: h } = this.pictureSize;
    const pixels = await this.v.view.snapshot(w, h);
    const canvas = document.createElement('canvas');
    canvas.width = w; canvas.height = h;
    const ctx = canvas.getContext('2d')!;
    ctx.putImageData(pixels, 0, 0);
    // text sized as on a 1080-pixel-high screen, scaled with the picture
    const scale = Math.max(1, h / 900);
    const cam = this.v.view.cameraFor(w, h);
    cam.updateMatrixWorld();
    // as the view projects: a point off the picture keeps its direction (its pin marks it on the edge)
    const project = (p: [number, number, number]) => {
      const c = new THREE.Vector3(p[0], p[1], p[2]).applyMatrix4(cam.matrixWorldInverse);
      if (c.z >= 0) { const n = Math.hypot(c.x, c.y) || 1; return { x: w / 2 + (c.x / n) * 1e6, y: h / 2 - (c.y / n) * 1e6, behind: false }; }
      const q = new THREE.Vector3(p[0], p[1], p[2]).project(cam);
      return { x: (q.x + 1) / 2 * w, y: (1 - q.y) / 2 * h, behind: false };
    };
    // legend and footer first: the pins are laid out clear of both
    const legend = this.v.legendState();
    const obstacles = legend ? [drawLegend(ctx, legend, scale)] : [];
    ctx.font = `${11 * scale}px system-ui, sans-serif`;
    const ctxText = this.context();
    const lines = [`fieldtally — ${ctxText.file} — ${ctxText.createdAt.slice(0, 10)}`, ...wrapText(ctx, `Caution: ${CAUTION}`, w * 0.6)];
    const footW = Math.max(...lines.map((l) => ctx.measureText(l).width)), footH = (8 + 15 * lines.length + 4) * scale;
    obstacles.push({ x: w - 12 * scale - footW, y: h - footH, width: footW + 12 * scale, height: footH });
    obstacles.push(await drawTriad(ctx, cam, w, h, scale, footH));
    drawPins(ctx, this.v.allResults, project, scale, obstacles, footH, this.v.pinOffsets);
    ctx.font = `${11 * scale}px system-ui, sans-serif`;
    ctx.fillStyle = '#4b5563';
    ctx.textAlign = 'right';
    ctx.textBaseline = 'bottom';
    lines.reverse().forEach((line, i) => ctx.fillText(line, w - 12 * scale, h - (8 + 15 * i) * scale));
    return new Promise((resolve, reject) => canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('the picture could not be encoded'))), 'image/png'));
  }

  private async png(): Promise<void> {
    download(`${this.baseName()}-view.png`, await this.picture());
  }

  private csv(): void {
    download(`${this.baseName()}-results.csv`, resultsAsCsv(this.v.allResults, this.context()), 'text/csv');
  }

  private json(): void {
    download(`${this.baseName()}-results.json`, resultsAsJson(this.v.allResults, this.context()), 'application/json');
  }

  private async copy(): Promise<void> {
    const text = resultsAsText(this.v.allResults, this.context());
    try {
      await navigator.clipboard.writeText(text);
      this.v.banner.notice('Results copied as text.');
    } catch {
      // no clipboard permission (e.g. not a secure context): offer the text as a file instead
      download(`${this.baseName()}-results.txt`, text);
      this.v.banner.notice('The clipboard is not available here; the results were saved as a text file instead.');
    }
  }
}

/** Breaks text into lines of at most `width` pixels at spaces. */
function wrapText(ctx: CanvasRenderingContext2D, text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    const next = line ? `${line} ${word}` : word;
    if (line && ctx.measureText(next).width > width) { lines.push(line); line = word; } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}
