/**
 * The material of every coloured surface in the view (boundary surfaces and the cut-plane): the value
 * attribute is mapped through the colour-map texture on the GPU, so changing the range or the map costs
 * no pass over the data on the main thread. Per-group flags (visible, selected) come from a small
 * texture indexed by the group attribute. Colours are managed as three.js does (sRGB table decoded on
 * sampling, encoded again on output), so the published table values reach the screen and exports unchanged.
 */
import * as THREE from 'three';
import { colorMapStrip, type ColorMap } from './colorMaps.ts';
import { NO_VALUE } from '../surface/wallDrawing.ts';

/** Colour of selected surface groups: their tint and rim here, their outline in selectionOutline.ts. */
export const SELECTION_COLOR = 0xff7a00;

/** Width of the flags texture; group g is at texel (g mod width, g div width). */
const FLAG_WIDTH = 1024;

/**
 * Clip-space position given to the vertices of hidden groups: beyond the far plane (z > w), so every
 * triangle or segment of the group is clipped before rasterisation.
 */
const HIDDEN_POSITION = 'vec4(0.0, 0.0, 2.0, 1.0)';

const VERTEX = /* glsl */ `
attribute float aValue;
attribute float aGroup;
uniform vec2 uRange;
uniform sampler2D uFlags;
varying float vT;
varying vec3 vNormal;
varying vec3 vView;
varying float vSelected;
varying float vMissing;
void main() {
  int g = int(aGroup + 0.5);
  vec4 f = texelFetch(uFlags, ivec2(g % ${FLAG_WIDTH}, g / ${FLAG_WIDTH}), 0);
  // a hidden group's vertices go beyond the far plane: its triangles are clipped whole (all three corners
  // carry the same group), so they cost no pixels at all instead of being shaded and thrown away
  if (f.r < 0.5) { gl_Position = ${HIDDEN_POSITION}; return; }
  // NO_VALUE (src/surface/wallDrawing.ts) marks a face without a value: drawn grey
  vMissing = aValue >= ${NO_VALUE / 10} ? 1.0 : 0.0;
  float span = uRange.y - uRange.x;
  vT = span > 0.0 ? (aValue - uRange.x) / span : 0.5;
  vSelected = f.g;
  vNormal = normalize(normalMatrix * normal);
  vec4 viewPosition = modelViewMatrix * vec4(position, 1.0);
  vView = -viewPosition.xyz;
  gl_Position = projectionMatrix * viewPosition;
}`;

const FRAGMENT = /* glsl */ `
uniform sampler2D uMap;
uniform float uSolid;
uniform vec3 uSolidColor;
uniform vec3 uSelectColor;
uniform float uOpacity;
varying float vT;
varying vec3 vNormal;
varying vec3 vView;
varying float vSelected;
varying float vMissing;
void main() {
  vec3 c = uSolid > 0.5 || vMissing > 0.5 ? uSolidColor : texture2D(uMap, vec2(clamp(vT, 0.0, 1.0) * 0.99609375 + 0.001953125, 0.5)).rgb;
  // selected groups: a light tint, and a rim where the surface turns away at grazing angles toward its
  // silhouette (a closed body has no outline to draw), opaque even when the surface is see-through; the
  // field's colours stay readable wherever the surface faces the viewer
  // how squarely the surface faces the eye (1: head-on, 0: seen edge-on, at a silhouette)
  float facing = abs(dot(normalize(vNormal), normalize(vView)));
  float rim = vSelected * (1.0 - smoothstep(0.2, 0.38, facing));
  // a mild headlight: enough to read the shape, little enough to keep colours readable against the legend
  float light = 0.72 + 0.28 * facing;
  vec3 lit = mix(c, uSelectColor, 0.05 * vSelected) * light;
  gl_FragColor = vec4(mix(lit, uSelectColor, 0.85 * rim), max(uOpacity, rim));
  #include <colorspace_fragment>
}`;

/** Uniforms of a field material, as set by `FieldMaterial`. */
interface FieldUniforms {
  [k: string]: THREE.IUniform;
  uRange: THREE.IUniform<THREE.Vector2>;
  uMap: THREE.IUniform<THREE.DataTexture>;
  uFlags: THREE.IUniform<THREE.DataTexture>;
  uSolid: THREE.IUniform<number>;
  uSolidColor: THREE.IUniform<THREE.Color>;
  uSelectColor: THREE.IUniform<THREE.Color>;
  uOpacity: THREE.IUniform<number>;
}

/** Colour-map texture (256×1 RGBA, linear filtering between table entries). */
export function colorMapTexture(map: ColorMap): THREE.DataTexture {
  const tex = new THREE.DataTexture(colorMapStrip(map), 256, 1, THREE.RGBAFormat, THREE.UnsignedByteType);
  tex.magFilter = THREE.LinearFilter;
  tex.minFilter = THREE.LinearFilter;
  tex.wrapS = THREE.ClampToEdgeWrapping;
  tex.colorSpace = THREE.SRGBColorSpace;
  tex.needsUpdate = true;
  return tex;
}

/** A ShaderMaterial colouring by `aValue` through a colour map, hiding and highlighting by `aGroup`. */
export class FieldMaterial extends THREE.ShaderMaterial {
  declare uniforms: FieldUniforms;
  private flags: Uint8Array;
  private flagTexture: THREE.DataTexture;
  private mapId: string;

  constructor(map: ColorMap, groupCount = 1) {
    const rows = Math.max(1, Math.ceil(groupCount / FLAG_WIDTH));
    const flags = new Uint8Array(4 * FLAG_WIDTH * rows);
    for (let i = 0; i < flags.length; i += 4) flags[i] = 255;
    const flagTexture = new THREE.DataTexture(flags, FLAG_WIDTH, rows, THREE.RGBAFormat, THREE.UnsignedByteType);
    flagTexture.needsUpdate = true;
    super({
      vertexShader: VERTEX,
      fragmentShader: FRAGMENT,
      side: THREE.DoubleSide,
      polygonOffset: true,
      polygonOffsetFactor: 1,
      polygonOffsetUnits: 1,
      uniforms: {
        uRange: { value: new THREE.Vector2(0, 1) },
        uMap: { value: colorMapTexture(map) },
        uFlags: { value: flagTexture },
        uSolid: { value: 0 },
        uSolidColor: { value: new THREE.Color(0xb8bec6) },
        uSelectColor: { value: new THREE.Color(SELECTION_COLOR) },
        uOpacity: { value: 1 },
      },
    });
    this.flags = flags;
    this.flagTexture = flagTexture;
    this.mapId = map.id;
  }

  /** Range of values mapped to the two ends of the colour map (file units). */
  setRange(lo: number, hi: number): void { this.uniforms.uRange.value.set(lo, hi); }

  setColorMap(map: ColorMap): void {
    // the same map again keeps its texture (a kept picture stays valid)
    if (map.id === this.mapId) return;
    this.mapId = map.id;
    this.uniforms.uMap.value.dispose();
    this.uniforms.uMap.value = colorMapTexture(map);
  }

  /** Solid grey instead of the colour map (no field chosen). */
  setSolid(solid: boolean): void { this.uniforms.uSolid.value = solid ? 1 : 0; }

  /** Shows or hides group `g`. */
  setGroupVisible(g: number, visible: boolean): void { this.setFlag(g, 0, visible); }

  /** Highlights group `g` (selected for a force total). */
  setGroupSelected(g: number, selected: boolean): void { this.setFlag(g, 1, selected); }

  private setFlag(g: number, channel: number, on: boolean): void {
    const i = 4 * g + channel;
    if (i >= this.flags.length) return;
    this.flags[i] = on ? 255 : 0;
    this.flagTexture.needsUpdate = true;
  }

  /** The flags texture, shared with the outline material so hidden groups lose their outlines too. */
  get groupFlags(): THREE.DataTexture { return this.flagTexture; }

  override dispose(): void {
    this.uniforms.uMap.value.dispose();
    this.flagTexture.dispose();
    super.dispose();
  }
}

/** Face outlines: thin dark lines, hidden with their group (reads the field material's flags). */
/** Opacity of one face's outline line. */
const OUTLINE_ALPHA = 0.35;

export class OutlineMaterial extends THREE.ShaderMaterial {
  constructor(flags: THREE.DataTexture) {
    super({
      vertexShader: /* glsl */ `
        attribute float aGroup;
        attribute float aShare;
        uniform sampler2D uFlags;
        varying float vAlpha;
        void main() {
          int g = int(aGroup + 0.5);
          // both ends of an outline segment carry its group: a hidden group's segments are clipped whole
          if (texelFetch(uFlags, ivec2(g % ${FLAG_WIDTH}, g / ${FLAG_WIDTH}), 0).r < 0.5) { gl_Position = ${HIDDEN_POSITION}; return; }
          // an edge drawn once for the n faces sharing it looks like n overlaid lines of opacity ALPHA
          vAlpha = 1.0 - pow(1.0 - ${OUTLINE_ALPHA.toFixed(2)}, max(aShare, 1.0));
          gl_Position = projectionMatrix * modelViewMatrix * vec4(position, 1.0);
        }`,
      fragmentShader: /* glsl */ `
        uniform vec3 uColor;
        varying float vAlpha;
        void main() {
          gl_FragColor = vec4(uColor, vAlpha);
          #include <colorspace_fragment>
        }`,
      transparent: true,
      uniforms: { uFlags: { value: flags }, uColor: { value: new THREE.Color(0x30343b) } },
    });
  }
}
