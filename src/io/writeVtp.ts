/**
 * Writes a surface of triangles (and optional line segments) as a VTK XML PolyData file (`.vtp`, version 1.0,
 * little-endian, inline base64 binary blocks with a UInt64 byte-count header). Points are Float64; every
 * per-vertex field goes to PointData, per-triangle fields and the source cell id to CellData. VTK orders
 * the cells of a PolyData piece verts, lines, polys, strips, so cell data lists the segments first, then the
 * triangles; a per-triangle field has NaN on the segments.
 */
import type { SurfaceField } from '../cut/triangleSet.ts';
import { base64Encode } from './base64Encode.ts';

/** What `writeVtp` writes. Layout as in `src/cut/triangleSet.ts`; `segments` two vertex numbers each. */
export interface VtpSurface {
  readonly positions: Float64Array;
  readonly indices: Uint32Array;
  readonly sourceCell: Int32Array;
  readonly fields: readonly SurfaceField[];
  readonly segments?: Uint32Array;
  /** Source cell of each segment (same length as segments / 2). */
  readonly segmentCell?: Int32Array;
}

const enc = new TextEncoder();

function block(bytes: Uint8Array): string {
  const head = new Uint8Array(8);
  new DataView(head.buffer).setBigUint64(0, BigInt(bytes.length), true);
  const whole = new Uint8Array(8 + bytes.length);
  whole.set(head); whole.set(bytes, 8);
  return new TextDecoder().decode(base64Encode(whole));
}

const bytesOf = (a: Float64Array | Int32Array | Int64Array): Uint8Array => new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
type Int64Array = BigInt64Array;

function dataArray(type: string, name: string, components: number, bytes: Uint8Array): string {
  const nc = components !== 1 ? ` NumberOfComponents="${components}"` : '';
  return `        <DataArray type="${type}" Name="${name.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;')}"${nc} format="binary">\n          ${block(bytes)}\n        </DataArray>\n`;
}

/** The `.vtp` bytes of `s`. */
export function writeVtp(s: VtpSurface): Uint8Array {
  const nv = s.positions.length / 3, nt = s.indices.length / 3;
  const seg = s.segments ?? new Uint32Array(0), ns = seg.length / 2;
  const segCell = s.segmentCell ?? new Int32Array(ns).fill(-1);
  let x = '<?xml version="1.0"?>\n<VTKFile type="PolyData" version="1.0" byte_order="LittleEndian" header_type="UInt64">\n  <PolyData>\n';
  x += `    <Piece NumberOfPoints="${nv}" NumberOfVerts="0" NumberOfLines="${ns}" NumberOfStrips="0" NumberOfPolys="${nt}">\n`;
  const pointFields = s.fields.filter((f) => f.association === 'point'), cellFields = s.fields.filter((f) => f.association === 'cell');
  x += '      <PointData>\n';
  for (const f of pointFields) x += dataArray('Float64', f.name, f.components, bytesOf(f.values));
  x += '      </PointData>\n      <CellData>\n';
  const ids = new Int32Array(ns + nt);
  ids.set(segCell); ids.set(s.sourceCell, ns);
  x += dataArray('Int32', 'sourceCell', 1, bytesOf(ids));
  for (const f of cellFields) {
    const v = new Float64Array((ns + nt) * f.components).fill(NaN);
    v.set(f.values, ns * f.components);
    x += dataArray('Float64', f.name, f.components, bytesOf(v));
  }
  x += '      </CellData>\n      <Points>\n';
  x += dataArray('Float64', 'Points', 3, bytesOf(s.positions)).replace(' Name="Points"', '');
  x += '      </Points>\n';
  const cells = (tag: string, conn: Uint32Array, per: number, n: number): string => {
    const c = new BigInt64Array(conn.length), o = new BigInt64Array(n);
    for (let i = 0; i < conn.length; i++) c[i] = BigInt(conn[i]!);
    for (let i = 0; i < n; i++) o[i] = BigInt(per * (i + 1));
    return `      <${tag}>\n${dataArray('Int64', 'connectivity', 1, bytesOf(c))}${dataArray('Int64', 'offsets', 1, bytesOf(o))}      </${tag}>\n`;
  };
  x += cells('Lines', seg, 2, ns);
  x += cells('Polys', s.indices, 3, nt);
  x += '    </Piece>\n  </PolyData>\n</VTKFile>\n';
  return enc.encode(x);
}
