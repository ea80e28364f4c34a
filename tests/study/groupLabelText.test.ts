/**
 * A probe set's `groupLabels` name surface groups in a report's files (HTML and JSON; the report's CSVs carry no definitions), for the app's
 * .zip and the command line's folder alike; probes still refer to groups by the file's names. The file is the
 * bundled Poiseuille pipe (sample-fields/README.md), whose boundary groups are feature parts `part 0` (inlet), `part 1` (wall) and `part 2` (outlet).
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readDataset } from '../../src/io/readDataset.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import { relabelGroups } from '../../src/study/groupLabelText.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { writeProbeSet } from '../../src/study/probeSetFile.ts';
import { reportFolder, REPORT_FILES } from '../../src/study/reportFolder.ts';

const PIPE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');

describe('group labels in result text', () => {
  it('relabels `<id> "<name>"` only', () => {
    const of = (n: string) => ({ wall: 'pipe wall' } as Record<string, string>)[n];
    expect(relabelGroups('force on 2 "wall" + 3 "outlet"; pressure "wall"', of)).toBe('force on 2 "pipe wall" + 3 "outlet"; pressure "wall"');
  });

  it('a report names the groups by the set\'s labels in its page and its JSON; without labels it keeps the file\'s names', async () => {
    const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
    const doc = {
      format: 'fieldtally-probe-set', version: 2, reference: { density: 998.207, viscosity: 1.0016e-3, speed: 0.05, area: 1, length: 1 },
      probes: [{ id: 'w', kind: 'force', geometry: { surfaces: ['part 1'] } }],
    };
    const build = (set: ReturnType<typeof checkProbeSet>) => {
      const evaluation = evaluateProbeSet(d, set);
      const files = reportFolder({
        title: 't', tool: 'fieldtally', version: '0', createdAt: '2026-01-01T00:00:00Z', caution: 'caution', probeSet: set, probeSetText: writeProbeSet(set),
        inputs: [], files: [{ file: 'pipe-medium.vtu', evaluation }], pictures: [], conventions: [],
      });
      return { evaluation, text: (name: string) => new TextDecoder().decode(files[name]) };
    };
    const plain = build(checkProbeSet(doc));
    expect(plain.evaluation.probes[0]!.ok).toBe(true);
    const id = /^force on (\d+) "part 1"/.exec(plain.evaluation.probes[0]!.definition)?.[1];
    expect(id).toBeDefined();
    const labelled = build(checkProbeSet({ ...doc, groupLabels: { 'part 1': 'pipe wall' } }));
    for (const f of [REPORT_FILES.html, REPORT_FILES.json]) {
      expect(plain.text(f)).toContain(`${id} `);
      expect(labelled.text(f)).toMatch(new RegExp(`${id} (&quot;|""|\\\\"|")pipe wall`));
      expect(labelled.text(f)).not.toMatch(new RegExp(`${id} (&quot;|""|\\\\"|")part 1`));
    }
    // the probe still names the group as the file does
    const saved = JSON.parse(labelled.text(REPORT_FILES.probeSet)) as { groupLabels: unknown; probes: { geometry: { surfaces: unknown } }[] };
    expect(saved.probes[0]!.geometry.surfaces).toEqual(['part 1']);
    expect(saved.groupLabels).toEqual({ 'part 1': 'pipe wall' });
  });
});
