/**
 * The outline drawn around selected surface groups: their outline segments (where a group meets another
 * or ends, from the worker's `groupOutline`) as screen-space lines of a fixed pixel width, a bright core on
 * a dark halo so it reads on every colour map. The colours inside the group stay as they are (the field
 * material adds only a light tint and a rim). Geometry holds only the selected groups' segments and is
 * rebuilt when the selection changes (a click), never per frame.
 */
import * as THREE from 'three';
import { LineMaterial } from 'three/examples/jsm/lines/LineMaterial.js';
import { LineSegments2 } from 'three/examples/jsm/lines/LineSegments2.js';
import { LineSegmentsGeometry } from 'three/examples/jsm/lines/LineSegmentsGeometry.js';
import type { GroupOutline } from '../../workers/api.ts';
import { SELECTION_COLOR } from './fieldMaterial.ts';

/** Colours and widths (pixels) of the selection outline; the core is the field material's selection colour. */
export const SELECTION_STYLE = { core: SELECTION_COLOR, coreWidth: 2.5, halo: 0x1f2937, haloWidth: 5.5 } as const;

/** The outline of the selected groups of one surface (`set` picks them); add `group` to the scene. */
export class SelectionOutline {
  readonly group = new THREE.Group();
  private readonly halo: LineSegments2;
  private readonly core: LineSegments2;
  private readonly size = new THREE.Vector2();

  constructor(private readonly outline: GroupOutline) {
    const material = (color: number, width: number) => new LineMaterial({ color, linewidth: width, worldUnits: false, depthWrite: false });
    this.halo = new LineSegments2(new LineSegmentsGeometry(), material(SELECTION_STYLE.halo, SELECTION_STYLE.haloWidth));
    this.core = new LineSegments2(new LineSegmentsGeometry(), material(SELECTION_STYLE.core, SELECTION_STYLE.coreWidth));
    // drawn after the surfaces, the core over its halo
    this.halo.renderOrder = 1;
    this.core.renderOrder = 2;
    for (const line of [this.halo, this.core]) {
      line.visible = false;
      line.frustumCulled = false;
      // line widths are in pixels of whatever the frame is drawn into (the view, or an exported picture)
      line.onBeforeRender = (renderer) => {
        const target = renderer.getRenderTarget();
        if (target) this.size.set(target.width, target.height); else renderer.getDrawingBufferSize(this.size);
        (line.material as LineMaterial).resolution.copy(this.size);
      };
      this.group.add(line);
    }
  }

  /** Outlines the groups in `ids` (indices, see `GroupInfo.id`); an empty set draws nothing. */
  set(ids: ReadonlySet<number>): void {
    const { positions, groups } = this.outline;
    const want = new Uint8Array(Math.max(0, ...ids) + 1);
    for (const g of ids) want[g] = 1;
    let n = 0;
    for (let s = 0; s < groups.length; s++) if (want[groups[s]!]) n++;
    const picked = new Float32Array(6 * n);
    for (let s = 0, k = 0; s < groups.length; s++) {
      if (!want[groups[s]!]) continue;
      picked.set(positions.subarray(6 * s, 6 * s + 6), 6 * k++);
    }
    for (const line of [this.halo, this.core]) {
      line.geometry.dispose();
      line.geometry = new LineSegmentsGeometry();
      if (n > 0) line.geometry.setPositions(picked);
      line.visible = n > 0;
    }
  }

  dispose(): void {
    for (const line of [this.halo, this.core]) {
      line.geometry.dispose();
      (line.material as LineMaterial).dispose();
    }
  }
}
