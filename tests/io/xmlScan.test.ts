/**
 * The byte-level tag scanner. Reference: the XML 1.0 specification (W3C, 5th ed.) for attribute quoting,
 * predefined entities (§4.6), comments and processing instructions; the VTK file-format description for
 * `<AppendedData>` (raw bytes after `_`).
 */
import { describe, expect, it } from 'vitest';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { buildSkeleton, scanSkeleton } from '../../src/io/xmlSkeleton.ts';
import { child, scanXml, type XmlElement } from '../../src/io/xmlScan.ts';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { copyingSource } from '../helpers/sources.ts';

const enc = (s: string) => new TextEncoder().encode(s);
const text = (bytes: Uint8Array, el: { textStart: number; textEnd: number }) => new TextDecoder().decode(bytes.subarray(el.textStart, el.textEnd));

describe('scanXml', () => {
  it('reads names, attributes in both quote styles, entities, comments and processing instructions', () => {
    const b = enc(`<?xml version="1.0"?>\n<!-- a comment with <tags> -->\n<VTKFile type='UnstructuredGrid' a="x &amp; y &lt;z&gt; &quot;q&quot; &#65;&#x42;">\n  <Piece NumberOfPoints = "3"/>\n  <Data Name="Flash Strength Points">1 2 3</Data>\n</VTKFile>\n`);
    const { root, appended } = scanXml(b, 'f.vtu');
    expect(appended).toBeUndefined();
    expect(root.name).toBe('VTKFile');
    expect(root.attrs.get('type')).toBe('UnstructuredGrid');
    expect(root.attrs.get('a')).toBe('x & y <z> "q" AB');
    expect(root.children.map((c) => c.name)).toEqual(['Piece', 'Data']);
    expect(child(root, 'Piece')!.attrs.get('NumberOfPoints')).toBe('3');
    const data = child(root, 'Data')!;
    expect(data.attrs.get('Name')).toBe('Flash Strength Points');
    expect(text(b, data)).toBe('1 2 3');
  });

  it('finds inline data before or after child elements', () => {
    const before = enc('<VTKFile><DataArray>\n  QUJD\n  <InformationKey name="k"><Value>1</Value></InformationKey>\n</DataArray></VTKFile>');
    const da1 = child(scanXml(before, 'f').root, 'DataArray')!;
    expect(text(before, da1).trim()).toBe('QUJD');
    const after = enc('<VTKFile><DataArray><InformationKey name="k"/>\n  QUJD\n</DataArray></VTKFile>');
    const da2 = child(scanXml(after, 'f').root, 'DataArray')!;
    expect(text(after, da2).trim()).toBe('QUJD');
    expect(da2.children[0]!.name).toBe('InformationKey');
  });

  it('stops at raw appended data, which may hold any byte, and locates it', () => {
    const head = enc('<VTKFile type="UnstructuredGrid"><UnstructuredGrid/><AppendedData encoding="raw">\n  _');
    const raw = Uint8Array.from([60, 47, 86, 84, 75, 0, 255, 60, 62, 1]);
    const tail = enc('\n</AppendedData>\n</VTKFile>\n');
    const b = new Uint8Array(head.length + raw.length + tail.length);
    b.set(head); b.set(raw, head.length); b.set(tail, head.length + raw.length);
    const { appended } = scanXml(b, 'f.vtu');
    expect(appended!.encoding).toBe('raw');
    expect(Array.from(b.subarray(appended!.start, appended!.start + raw.length))).toEqual(Array.from(raw));
    expect(appended!.end).toBe(head.length + raw.length + 1);
  });

  it('locates base64 appended data', () => {
    const b = enc('<VTKFile><AppendedData encoding="base64">\n _QUJD\n</AppendedData></VTKFile>');
    const { appended } = scanXml(b, 'f.vtu');
    expect(appended!.encoding).toBe('base64');
    expect(text(b, { textStart: appended!.start, textEnd: appended!.end }).trim()).toBe('QUJD');
  });

  it('reports malformed and truncated files with the file name and position', () => {
    const full = '<VTKFile type="UnstructuredGrid"><UnstructuredGrid><Piece NumberOfPoints="1"></Piece></UnstructuredGrid></VTKFile>';
    for (let cut = 1; cut < full.length; cut += 7) {
      expect(() => scanXml(enc(full.slice(0, cut)), 'cut.vtu'), `cut at ${cut}`).toThrow(/^cut\.vtu: /);
    }
    expect(() => scanXml(enc('<VTKFile><A></B></VTKFile>'), 'm.vtu')).toThrow('m.vtu: closing tag </B> at byte 12 does not match <A> opened at byte 9');
    expect(() => scanXml(enc('<VTKFile a=1/>'), 'q.vtu')).toThrow(/q\.vtu: value of attribute "a" of <VTKFile> at byte 11 is not quoted/);
    expect(() => scanXml(enc('<VTKFile><![CDATA[x]]></VTKFile>'), 'c.vtu')).toThrow(/CDATA/);
    expect(() => scanXml(enc('<VTKFile><AppendedData encoding="raw">_abc'), 'r.vtu')).toThrow(/r\.vtu: file ends inside the raw appended data/);
    expect(() => scanXml(enc('<VTKFile><AppendedData encoding="raw">abc</AppendedData></VTKFile>'), 'u.vtu')).toThrow(/must start with "_"/);
    expect(() => scanXml(enc('<VTKFile><AppendedData encoding="zip">_</AppendedData></VTKFile>'), 'z.vtu')).toThrow(/encoding="zip"/);
    expect(() => scanXml(enc('   '), 'e.vtu')).toThrow('e.vtu: no XML element found');
  });
});

describe('structure from a streamed skeleton (files with inline data read by ranges)', () => {
  // Reference: scanXml on the whole bytes; the skeleton must give the same tree with the same file positions.
  const shape = (el: XmlElement): unknown => ({ name: el.name, attrs: [...el.attrs], at: el.at, text: [el.textStart, el.textEnd], children: el.children.map(shape) });
  const ascii = Buffer.from(writeVtu(datasetOf([hexGrid(6, 5, 4)], 'm'), { encoding: 'ascii' })).toString('latin1')
    .replace('<UnstructuredGrid>', '<!-- a > b <c> --><?pi x?>\n<UnstructuredGrid>')
    .replace(/<DataArray type="Float64" Name="Points"/, '<DataArray type="Float64" Name="Points" note="a>b"');

  it('gives the tree and positions of scanXml on the whole file, in chunks of any size; the skeleton is small', async () => {
    const bytes = new Uint8Array(Buffer.from(ascii, 'latin1'));
    const want = shape(scanXml(bytes, 'm.vtu').root);
    for (const chunkBytes of [1, 2, 7, 64, 4096]) {
      const doc = await scanSkeleton(copyingSource('m.vtu', bytes, { chunkBytes }), 'm.vtu');
      expect(shape(doc!.root), `chunks of ${chunkBytes}`).toEqual(want);
    }
    const sk = await buildSkeleton(copyingSource('m.vtu', bytes));
    expect(sk!.bytes.length).toBeLessThan(bytes.length / 10);
  });

  it('errors carry file positions; a file with appended data is left to the whole-file path', async () => {
    const cut = new Uint8Array(Buffer.from(ascii.slice(0, ascii.indexOf('</Points>')), 'latin1'));
    const whole = (() => { try { scanXml(cut, 'm.vtu'); return ''; } catch (e) { return (e as Error).message; } })();
    expect(whole).toMatch(/^m\.vtu: file ends inside <\w+> opened at byte \d+/);
    await expect(scanSkeleton(copyingSource('m.vtu', cut, { chunkBytes: 100 }), 'm.vtu')).rejects.toThrow(whole);
    const raw = writeVtu(datasetOf([hexGrid(2, 2, 2)], 'r'), { encoding: 'appended-raw' });
    expect(await buildSkeleton(copyingSource('r.vtu', raw))).toBeUndefined();
  });
});
