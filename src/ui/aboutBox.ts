/** The about box: what the tool does, where the numbers come from, the safety caution. */
import { CAUTION } from '../study/caution.ts';

const TEXT = [
  'fieldtally reads unstructured VTK result files (legacy .vtk, XML .vtu/.vtp, .pvtu/.vtm sets) in your browser and computes numbers from them: cut-plane integrals (flow rates, weighted means, total pressure), line probes, and surface force totals with coefficients.',
  'Nothing leaves this computer: the files are read locally and the page makes no network requests.',
  'Values are in the file\'s units; the labels assume SI (m, s, kg, Pa). Signs follow the normals you set: a flow rate is positive along the plane normal; forces act on the selected surfaces.',
  'Colour maps: viridis and magma (van der Walt & Smith, CC0), RdBu (Cynthia Brewer, ColorBrewer, Apache-2.0).',
];

export class AboutBox {
  private readonly dialog: HTMLDialogElement;

  /** `workersNote`: how many compute workers this page uses and why (src/parallel/poolPlan.ts). */
  constructor(host: HTMLElement, workersNote?: string) {
    this.dialog = document.createElement('dialog');
    this.dialog.className = 'about';
    const h = document.createElement('h2');
    h.textContent = 'About fieldtally';
    this.dialog.append(h);
    for (const t of TEXT) { const p = document.createElement('p'); p.textContent = t; this.dialog.append(p); }
    if (workersNote) {
      const w = document.createElement('p');
      w.className = 'workers';
      w.textContent = workersNote;
      this.dialog.append(w);
    }
    const c = document.createElement('p');
    c.className = 'caution';
    c.textContent = `Caution: ${CAUTION}`;
    const close = document.createElement('button');
    close.type = 'button';
    close.textContent = 'Close';
    close.onclick = () => this.dialog.close();
    this.dialog.append(c, close);
    host.append(this.dialog);
  }

  open(): void { this.dialog.showModal(); }
}
