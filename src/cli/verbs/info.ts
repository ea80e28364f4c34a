/** `fieldtally info <file> [--json]`: the load report of a result file. */
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { CELL_TYPE_NAMES } from '../../model/cellTypes.ts';
import { loadReport, type ArraySummary } from '../../model/loadReport.ts';
import { parseArgs } from '../args.ts';
import type { Verb } from '../verb.ts';

const fmt = (v: number) => (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6) || v === 0 ? String(Number(v.toPrecision(6))) : v.toExponential(5);

function arrayLines(title: string, list: ArraySummary[]): string[] {
  if (list.length === 0) return [`${title}: none`];
  return [`${title}:`, ...list.map((a) => `  ${a.name} [${a.type}×${a.components}] range ${a.range ? `${fmt(a.range[0])} … ${fmt(a.range[1])}${a.components > 1 ? ' (magnitude)' : ''}` : 'empty'}`)];
}

const info: Verb = {
  summary: 'what a result file holds: points, cells by type, arrays with ranges, bounds',
  usage: 'fieldtally info <file> [--json]\n  Prints the load report. Values are in the file\'s units.',
  options: { json: 'boolean' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'info');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally info <file> [--json]');
    const report = loadReport(await loadDatasetFile(file));
    if (args.options.json) { io.out(JSON.stringify(report, null, 2)); return 0; }
    const b = report.bounds;
    io.out([
      `${report.source}: ${report.kind === 'polydata' ? 'polygonal data' : 'unstructured grid'}, ${report.pieces} piece(s)`,
      `points: ${report.points}   cells: ${report.cells}`,
      'cells by type:',
      ...Object.entries(report.cellTypes).map(([t, n]) => `  ${(CELL_TYPE_NAMES[Number(t)] ?? `type ${t}`).padEnd(24)} ${n}`),
      ...arrayLines('point data', report.pointData),
      ...arrayLines('cell data', report.cellData),
      ...(report.fieldData.length ? arrayLines('field data', report.fieldData) : []),
      `bounds: ${b ? `x ${fmt(b[0])} … ${fmt(b[1])}, y ${fmt(b[2])} … ${fmt(b[3])}, z ${fmt(b[4])} … ${fmt(b[5])}` : 'none (no points)'}`,
      ...report.warnings.map((w) => `warning: ${w}`),
    ].join('\n'));
    return 0;
  },
};
export default info;
