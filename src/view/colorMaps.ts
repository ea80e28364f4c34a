/**
 * Colour maps as data: each map is a list of sRGB colours, evenly spaced from the low end (0) to the
 * high end (1) of the field range, and is drawn through a small texture with linear filtering.
 *
 * Sources (published tables, used unchanged):
 *  - viridis, magma: Stéfan van der Walt and Nathaniel Smith, 2015, CC0; the 256-entry tables as
 *    listed in matplotlib's `lib/matplotlib/_cm_listed.py`, rounded here to 8 bits per channel.
 *  - RdBu: Cynthia Brewer, ColorBrewer 2.0, 11-class diverging "RdBu", Apache-2.0; listed here from
 *    blue (low) to red (high), the usual orientation for signed quantities (e.g. Cp, u·n).
 */

/** One colour map: `colors` is `n` packed RGB triplets (0–255), low end first. */
export interface ColorMap {
  /** Key used by the panel and in saved settings. */
  readonly id: ColorMapId;
  /** Name shown in the panel (the published name). */
  readonly label: string;
  /** Diverging maps are centred: with an automatic range the viewer makes it symmetric about zero when the data change sign. */
  readonly diverging: boolean;
  readonly colors: Uint8Array;
}

export type ColorMapId = 'viridis' | 'magma' | 'rdbu';

function fromHex(hex: string): Uint8Array {
  const out = new Uint8Array(hex.length / 2);
  for (let i = 0; i < out.length; i++) out[i] = parseInt(hex.slice(2 * i, 2 * i + 2), 16);
  return out;
}

const VIRIDIS =
  '44015444025645045745055946075a46085c460a5d460b5e470d60470e61471063471164471365481467481668481769' +
  '48186a481a6c481b6d481c6e481d6f481f70482071482173482374482475482576482677482878482979472a7a472c7a' +
  '472d7b472e7c472f7d46307e46327e46337f463480453581453781453882443983443a83443b84433d84433e85423f85' +
  '4240864241864142874144874045884046883f47883f48893e49893e4a893e4c8a3d4d8a3d4e8a3c4f8a3c508b3b518b' +
  '3b528b3a538b3a548c39558c39568c38588c38598c375a8c375b8d365c8d365d8d355e8d355f8d34608d34618d33628d' +
  '33638d32648e32658e31668e31678e31688e30698e306a8e2f6b8e2f6c8e2e6d8e2e6e8e2e6f8e2d708e2d718e2c718e' +
  '2c728e2c738e2b748e2b758e2a768e2a778e2a788e29798e297a8e297b8e287c8e287d8e277e8e277f8e27808e26818e' +
  '26828e26828e25838e25848e25858e24868e24878e23888e23898e238a8d228b8d228c8d228d8d218e8d218f8d21908d' +
  '21918c20928c20928c20938c1f948c1f958b1f968b1f978b1f988b1f998a1f9a8a1e9b8a1e9c891e9d891f9e891f9f88' +
  '1fa0881fa1881fa1871fa28720a38620a48621a58521a68522a78522a88423a98324aa8325ab8225ac8226ad8127ad81' +
  '28ae8029af7f2ab07f2cb17e2db27d2eb37c2fb47c31b57b32b67a34b67935b77937b87838b9773aba763bbb753dbc74' +
  '3fbc7340bd7242be7144bf7046c06f48c16e4ac16d4cc26c4ec36b50c46a52c56954c56856c66758c7655ac8645cc863' +
  '5ec96260ca6063cb5f65cb5e67cc5c69cd5b6ccd5a6ece5870cf5773d05675d05477d1537ad1517cd2507fd34e81d34d' +
  '84d44b86d54989d5488bd6468ed64590d74393d74195d84098d83e9bd93c9dd93ba0da39a2da37a5db36a8db34aadc32' +
  'addc30b0dd2fb2dd2db5de2bb8de29bade28bddf26c0df25c2df23c5e021c8e020cae11fcde11dd0e11cd2e21bd5e21a' +
  'd8e219dae319dde318dfe318e2e418e5e419e7e419eae51aece51befe51cf1e51df4e61ef6e620f8e621fbe723fde725';

const MAGMA =
  '00000401000501010601010802010902020b02020d03030f03031204041405041606051806051a07061c08071e090720' +
  '0a08220b09240c09260d0a290e0b2b100b2d110c2f120d31130d34140e36150e38160f3b180f3d19103f1a10421c1044' +
  '1d11471e114920114b21114e22115024125325125527125829115a2a115c2c115f2d11612f1163311165331067341069' +
  '36106b38106c390f6e3b0f703d0f713f0f72400f74420f75440f764510774710784910784a10794c117a4e117b4f127b' +
  '51127c52137c54137d56147d57157e59157e5a167e5c167f5d177f5f187f601880621980641a80651a80671b80681c81' +
  '6a1c816b1d816d1d816e1e81701f81721f817320817521817621817822817922827b23827c23827e2482802582812581' +
  '8326818426818627818827818928818b29818c29818e2a81902a81912b81932b80942c80962c80982d80992d809b2e7f' +
  '9c2e7f9e2f7fa02f7fa1307ea3307ea5317ea6317da8327daa337dab337cad347cae347bb0357bb2357bb3367ab5367a' +
  'b73779b83779ba3878bc3978bd3977bf3a77c03a76c23b75c43c75c53c74c73d73c83e73ca3e72cc3f71cd4071cf4070' +
  'd0416fd2426fd3436ed5446dd6456cd8456cd9466bdb476adc4869de4968df4a68e04c67e24d66e34e65e44f64e55064' +
  'e75263e85362e95462ea5661eb5760ec5860ed5a5fee5b5eef5d5ef05f5ef1605df2625df2645cf3655cf4675cf4695c' +
  'f56b5cf66c5cf66e5cf7705cf7725cf8745cf8765cf9785df9795df97b5dfa7d5efa7f5efa815ffb835ffb8560fb8761' +
  'fc8961fc8a62fc8c63fc8e64fc9065fd9266fd9467fd9668fd9869fd9a6afd9b6bfe9d6cfe9f6dfea16efea36ffea571' +
  'fea772fea973feaa74feac76feae77feb078feb27afeb47bfeb67cfeb77efeb97ffebb81febd82febf84fec185fec287' +
  'fec488fec68afec88cfeca8dfecc8ffecd90fecf92fed194fed395fed597fed799fed89afdda9cfddc9efddea0fde0a1' +
  'fde2a3fde3a5fde5a7fde7a9fde9aafdebacfcecaefceeb0fcf0b2fcf2b4fcf4b6fcf6b8fcf7b9fcf9bbfcfbbdfcfdbf';

/** ColorBrewer RdBu (11 classes), reversed to run blue → red. */
const RDBU = ['053061', '2166ac', '4393c3', '92c5de', 'd1e5f0', 'f7f7f7', 'fddbc7', 'f4a582', 'd6604d', 'b2182b', '67001f'].join('');

/** Every map, default first. */
export const COLOR_MAPS: readonly ColorMap[] = [
  { id: 'viridis', label: 'viridis', diverging: false, colors: fromHex(VIRIDIS) },
  { id: 'magma', label: 'magma', diverging: false, colors: fromHex(MAGMA) },
  { id: 'rdbu', label: 'RdBu (diverging)', diverging: true, colors: fromHex(RDBU) },
];

/** The default map: viridis (perceptually uniform, readable in grey and by most colour-blind readers). */
export const DEFAULT_COLOR_MAP: ColorMapId = 'viridis';

/** Looks a map up by id; unknown ids fall back to the default. */
export function colorMap(id: string): ColorMap {
  return COLOR_MAPS.find((m) => m.id === id) ?? COLOR_MAPS[0]!;
}

/**
 * Colour at position t in [0, 1] (clamped), linearly interpolated between table entries,
 * written as 0–255 RGB into `out[at..at+2]`.
 */
export function sampleColorMap(map: ColorMap, t: number, out: Uint8Array | Uint8ClampedArray | number[], at = 0): void {
  const c = map.colors, n = c.length / 3;
  const x = (t <= 0 ? 0 : t >= 1 ? 1 : t) * (n - 1);
  const i = Math.min(n - 2, Math.floor(x)), f = x - i;
  for (let k = 0; k < 3; k++) out[at + k] = Math.round(c[3 * i + k]! * (1 - f) + c[3 * i + 3 + k]! * f);
}

/** A CSS colour string for position t (legend drawing). */
export function colorMapCss(map: ColorMap, t: number): string {
  const rgb = [0, 0, 0];
  sampleColorMap(map, t, rgb);
  return `rgb(${rgb[0]},${rgb[1]},${rgb[2]})`;
}

/** RGBA bytes of a `width`-texel strip of the map, for a 1-D lookup texture. */
export function colorMapStrip(map: ColorMap, width = 256): Uint8Array {
  const out = new Uint8Array(4 * width), rgb = [0, 0, 0];
  for (let i = 0; i < width; i++) {
    sampleColorMap(map, i / (width - 1), rgb);
    out[4 * i] = rgb[0]!; out[4 * i + 1] = rgb[1]!; out[4 * i + 2] = rgb[2]!; out[4 * i + 3] = 255;
  }
  return out;
}
