/**
 * Hand-built VTK XML files for reader tests, assembled byte by byte from the file-format description
 * (VTK's "VTK File Formats" document: header words, zlib block headers, base64 runs). Independent of
 * fieldtally's own writer: numbers are packed with DataView, base64 comes from Node's Buffer and zlib
 * streams from Node's zlib (the reference zlib library), so a reader bug cannot cancel a writer bug.
 */
import { deflateSync } from 'node:zlib';

export type XmlType = 'Int8' | 'UInt8' | 'Int16' | 'UInt16' | 'Int32' | 'UInt32' | 'Int64' | 'UInt64' | 'Float32' | 'Float64';

/** One DataArray: values in tuple order. `raw` replaces the encoded payload (for corrupt-data tests). */
export interface ArraySpec {
  name?: string;
  type: XmlType | string;
  values: ArrayLike<number | bigint>;
  components?: number;
  /** Extra attributes, written verbatim. */
  extra?: string;
  /** Force a format for this array only. */
  format?: Encoding;
}

export interface SectionSpec {
  tag: string;
  attrs?: Record<string, string | number>;
  arrays: ArraySpec[];
}

export interface PieceSpec {
  attrs: Record<string, string | number>;
  sections: SectionSpec[];
}

export type Encoding = 'ascii' | 'binary' | 'appended-raw' | 'appended-base64';

export interface BuildOptions {
  encoding: Encoding;
  headerType?: 'UInt32' | 'UInt64';
  /** Omit the header_type attribute (readers must default to UInt32). */
  omitHeaderType?: boolean;
  bigEndian?: boolean;
  /** zlib-compress binary data in blocks of this many bytes. */
  zlibBlockSize?: number;
  /** Encode header and data as one base64 run instead of VTK's two separately padded runs. */
  jointBase64?: boolean;
  version?: string;
  compressor?: string;
  fieldData?: ArraySpec[];
  /** Text between the `_` of raw appended data and the first array (shifts alignment). */
  appendedLead?: number;
}

export const SIZE: Record<XmlType, number> = { Int8: 1, UInt8: 1, Int16: 2, UInt16: 2, Int32: 4, UInt32: 4, Int64: 8, UInt64: 8, Float32: 4, Float64: 8 };

/** Packs numbers as `type` in the given byte order. */
export function pack(type: XmlType, values: ArrayLike<number | bigint>, littleEndian: boolean): Uint8Array {
  const out = new Uint8Array(values.length * SIZE[type]);
  const dv = new DataView(out.buffer);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!, o = i * SIZE[type];
    switch (type) {
      case 'Int8': dv.setInt8(o, Number(v)); break;
      case 'UInt8': dv.setUint8(o, Number(v)); break;
      case 'Int16': dv.setInt16(o, Number(v), littleEndian); break;
      case 'UInt16': dv.setUint16(o, Number(v), littleEndian); break;
      case 'Int32': dv.setInt32(o, Number(v), littleEndian); break;
      case 'UInt32': dv.setUint32(o, Number(v), littleEndian); break;
      case 'Int64': dv.setBigInt64(o, BigInt(v), littleEndian); break;
      case 'UInt64': dv.setBigUint64(o, BigInt(v), littleEndian); break;
      case 'Float32': dv.setFloat32(o, Number(v), littleEndian); break;
      case 'Float64': dv.setFloat64(o, Number(v), littleEndian); break;
    }
  }
  return out;
}

export function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}

/** Header and payload of one binary array: `[count]` or `[nBlocks, blockSize, last, sizes…]` + blocks. */
export function binaryBlock(data: Uint8Array, opts: BuildOptions): { header: Uint8Array; payload: Uint8Array } {
  const ht = opts.headerType ?? 'UInt32', le = !opts.bigEndian;
  if (!opts.zlibBlockSize) return { header: pack(ht, [data.length], le), payload: data };
  const bs = opts.zlibBlockSize;
  const blocks: Uint8Array[] = [];
  for (let o = 0; o < data.length; o += bs) blocks.push(new Uint8Array(deflateSync(data.subarray(o, Math.min(o + bs, data.length)))));
  const last = data.length % bs;
  return { header: pack(ht, [blocks.length, bs, last, ...blocks.map((b) => b.length)], le), payload: concat(blocks) };
}

const b64 = (b: Uint8Array) => Buffer.from(b).toString('base64');
const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;');

function isXmlType(t: string): t is XmlType {
  return t in SIZE;
}

/**
 * Builds a complete file. Arrays are written in the chosen encoding; binary ones get block headers
 * as described in `BuildOptions`.
 */
export function buildXml(type: 'UnstructuredGrid' | 'PolyData', pieces: PieceSpec[], opts: BuildOptions): Uint8Array {
  const le = !opts.bigEndian;
  const appended: Uint8Array[] = [];
  let appendedLength = 0;
  if (opts.appendedLead) { appended.push(new Uint8Array(opts.appendedLead)); appendedLength += opts.appendedLead; }
  let appendedB64 = '';
  const arrayXml = (a: ArraySpec, indent: string): string => {
    const enc = a.format ?? opts.encoding;
    const attrs = `type="${a.type}"${a.name !== undefined ? ` Name="${esc(a.name)}"` : ''}${a.components ? ` NumberOfComponents="${a.components}"` : ''}${a.extra ? ` ${a.extra}` : ''}`;
    if (enc === 'ascii' || !isXmlType(a.type)) {
      return `${indent}<DataArray ${attrs} format="ascii">\n${indent}  ${Array.from(a.values, (v) => String(v)).join(' ')}\n${indent}</DataArray>\n`;
    }
    const { header, payload } = binaryBlock(pack(a.type, a.values, le), opts);
    if (enc === 'binary') {
      const text = opts.jointBase64 ? b64(concat([header, payload])) : b64(header) + b64(payload);
      return `${indent}<DataArray ${attrs} format="binary">\n${indent}  ${text}\n${indent}</DataArray>\n`;
    }
    if (enc === 'appended-raw') {
      const offset = appendedLength;
      appended.push(header, payload);
      appendedLength += header.length + payload.length;
      return `${indent}<DataArray ${attrs} format="appended" offset="${offset}"/>\n`;
    }
    const offset = appendedB64.length;
    appendedB64 += opts.jointBase64 ? b64(concat([header, payload])) : b64(header) + b64(payload);
    return `${indent}<DataArray ${attrs} format="appended" offset="${offset}"/>\n`;
  };
  const attrText = (attrs: Record<string, string | number> | undefined) =>
    Object.entries(attrs ?? {}).map(([k, v]) => ` ${k}="${esc(String(v))}"`).join('');
  let xml = '<?xml version="1.0"?>\n';
  xml += `<VTKFile type="${type}" version="${opts.version ?? '1.0'}" byte_order="${le ? 'LittleEndian' : 'BigEndian'}"`;
  if (!opts.omitHeaderType) xml += ` header_type="${opts.headerType ?? 'UInt32'}"`;
  if (opts.compressor ?? (opts.zlibBlockSize ? 'vtkZLibDataCompressor' : undefined)) xml += ` compressor="${opts.compressor ?? 'vtkZLibDataCompressor'}"`;
  xml += `>\n  <${type}>\n`;
  if (opts.fieldData) {
    xml += '    <FieldData>\n' + opts.fieldData.map((a) => arrayXml(a, '      ')).join('') + '    </FieldData>\n';
  }
  for (const p of pieces) {
    xml += `    <Piece${attrText(p.attrs)}>\n`;
    for (const s of p.sections) xml += `      <${s.tag}${attrText(s.attrs)}>\n${s.arrays.map((a) => arrayXml(a, '        ')).join('')}      </${s.tag}>\n`;
    xml += '    </Piece>\n';
  }
  xml += `  </${type}>\n`;
  const enc = new TextEncoder();
  if (opts.encoding === 'appended-raw') {
    return concat([enc.encode(xml + '  <AppendedData encoding="raw">\n   _'), concat(appended), enc.encode('\n  </AppendedData>\n</VTKFile>\n')]);
  }
  if (opts.encoding === 'appended-base64') {
    return enc.encode(xml + `  <AppendedData encoding="base64">\n   _${appendedB64}\n  </AppendedData>\n</VTKFile>\n`);
  }
  return enc.encode(xml + '</VTKFile>\n');
}

/** A two-cell unstructured piece (a tetra and a pyramid sharing a face) with point and cell data. */
export function tetPyramidPiece(idType: XmlType = 'Int32', typesType: XmlType = 'UInt8'): PieceSpec {
  return {
    attrs: { NumberOfPoints: 6, NumberOfCells: 2 },
    sections: [
      { tag: 'PointData', attrs: { Scalars: 'static pressure' }, arrays: [
        { name: 'static pressure', type: 'Float64', values: [101325, 101300.5, 101290.25, 101310, 101280.125, 101305] },
        { name: 'U', type: 'Float32', components: 3, values: [1, 0, 0, 2, 0.5, 0, 3, 0, 0.25, 1.5, 1, 1, 0, 0, 0, -1, 2, 0.5] },
      ] },
      { tag: 'CellData', arrays: [{ name: 'zone', type: 'Int16', values: [3, -7] }] },
      { tag: 'Points', arrays: [{ type: 'Float64', components: 3, values: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 1, 0.5, 0.5, -1] }] },
      { tag: 'Cells', arrays: [
        { name: 'connectivity', type: idType, values: [0, 1, 2, 3, 4, 0, 1, 3, 5] },
        { name: 'offsets', type: idType, values: [5, 9] },
        { name: 'types', type: typesType, values: [14, 10] },
      ] },
    ],
  };
}
