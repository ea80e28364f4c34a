/**
 * Entry of the viewer page: builds the viewer and its tools, wires the file inputs, and opens the
 * bundled sample field (served from this origin, like every other asset).
 */
import '../ui/styles.css';
import sampleUrl from '../../sample-fields/sphere-stokes.vtu?url';
import { startCompute } from './computeClient.ts';
import { loadRequestFor } from './fileChoice.ts';
import { ExportTool } from './exportTool.ts';
import { DerivedTool } from './derivedTool.ts';
import { ForceTool } from './forceTool.ts';
import { IsoTool } from './isoTool.ts';
import { FormulaTool } from './formulaTool.ts';
import { LineTool } from './lineTool.ts';
import { LossTool } from './lossTool.ts';
import { PlaneTool } from './planeTool.ts';
import { ProbeSetTool } from './probeSetTool.ts';
import { ReferenceTool } from './referenceTool.ts';
import { ReportTool } from './reportTool.ts';
import { seriesChoiceFor, type SeriesChoice } from './seriesChoice.ts';
import { SeriesTool } from './seriesTool.ts';
import { bindShortcuts } from './shortcuts.ts';
import { SplitTool } from './splitTool.ts';
import { WallTool } from './wallTool.ts';
import { LineChart } from '../ui/lineChart.ts';
import { Viewer } from './viewer.ts';
import { ensureIsolation } from './isolation.ts';

/** The bundled sample opened at start (slow viscous flow past a small sphere; see sample-fields/). */
const SAMPLE_NAME = 'sphere-stokes.vtu';

const $ = <T extends HTMLElement>(id: string): T => document.getElementById(id) as T;

// On a plain static server, a service worker adds the isolation headers; the page reloads once under it.
await ensureIsolation();

const viewer = new Viewer(startCompute(), {
  canvas: $('view-canvas'), overlay: $('overlay'), side: $('side'), tools: $('view-tools'),
  results: $('results-pane'), progress: $('progress-host'), summary: $('file-summary'),
});

const refs = new ReferenceTool(viewer);
// before the other tools: on a new file the formulas reach the worker before any probe's request
const derived = new DerivedTool(viewer, refs);
const planes = new PlaneTool(viewer, refs);
const lines = new LineTool(viewer, new LineChart($('chart-pane')));
const force = new ForceTool(viewer, refs);
const losses = new LossTool(viewer, planes, refs);
const splits = new SplitTool(viewer, planes, refs);
const isoSurfaces = new IsoTool(viewer, refs);
const exporter = new ExportTool(viewer, viewer.gui);
const reports = new ReportTool(viewer, exporter, () => lines.reportFiles());
const walls = new WallTool(viewer, refs);
const formulas = new FormulaTool(viewer, derived);
// after the tools: on a new file it re-applies the set once they have dropped the old file's probes
const probeSets = new ProbeSetTool(viewer, { refs, planes, lines, force, losses, splits, iso: isoSurfaces, walls, formulas }, $('compare-pane'), (set) => reports.download(set));
const series = new SeriesTool(viewer, probeSets, { view: $('view'), drawer: document.querySelector<HTMLElement>('.drawer')! });
const keys = bindShortcuts({
  undo: () => void probeSets.undo(),
  redo: () => void probeSets.redo(),
  removeSelected: () => { if (viewer.selectedId) viewer.removeResult(viewer.selectedId, true); },
  newPlane: () => planes.add(),
  newLine: () => lines.add(),
  fit: () => viewer.view.fit(),
});
$('keys-button').addEventListener('click', () => keys.toggle());

for (const id of ['file-input', 'folder-input']) {
  const input = $<HTMLInputElement>(id);
  input.addEventListener('change', () => {
    const files = [...(input.files ?? [])];
    input.value = '';
    if (files.length === 0) return;
    performance.mark('fieldtally:files-chosen');
    let choice: SeriesChoice | null;
    try {
      choice = seriesChoiceFor(files);
    } catch (e) {
      viewer.banner.error(`Could not open the series: ${(e as Error).message}`);
      return;
    }
    if (choice) { void series.openSeries(choice); return; }
    try {
      // a single result ends the series once it is open (a failed load keeps the series)
      void viewer.load(loadRequestFor(files)).then((ok) => { if (ok) series.close(); });
    } catch (e) {
      viewer.banner.error(`Could not open the files: ${(e as Error).message}`);
    }
  });
}
$('about-button').addEventListener('click', () => viewer.about.open());

/** Inspection hook for the browser tests: where the cut-plane's drag knob is on screen (CSS pixels of the page). */
(window as unknown as { __fieldtally: unknown }).__fieldtally = {
  knobScreen(): [number, number] | undefined {
    const k = planes.knobPosition();
    if (!k) return undefined;
    const p = viewer.view.project(k), r = viewer.view.canvas.getBoundingClientRect();
    return [r.left + p.x, r.top + p.y];
  },
  /** The last software frames' costs (ms), for the viewer benchmark. */
  frameTimes(): { draw: number; raster: number; show: number }[] { return [...viewer.view.frameTimes]; },
  /** Software frames drawn over the kept picture of the surface, and switching that keeping off and on (tests). */
  keptFrames(): number { return viewer.view.stillFrames; },
  keepSurface(on: boolean): Promise<void> {
    const s = viewer.surface;
    viewer.view.keepStill(on ? s?.group : undefined, s && (() => s.stillKey()));
    return viewer.view.nextFrame();
  },
  /** A probe's pin anchor (file length unit), or undefined. */
  anchor(id: string): [number, number, number] | undefined {
    return viewer.allResults.find((r) => r.id === id)?.anchor;
  },
};

document.body.dataset['state'] = 'empty';
void viewer.load({ kind: 'url', url: new URL(sampleUrl, document.baseURI).href, name: SAMPLE_NAME });
