/**
 * Planes that a pressure loss or a flow split is built on: a link to one of the view's cut-planes, which
 * it follows as that plane moves, or a position of its own (from a loaded probe set, or kept when the
 * linked plane is removed). Pure: no DOM.
 */
import type { PlaneDoc } from '../study/probeSet.ts';

/** A plane used by a composite probe. */
export interface PlaneLink {
  /** The cut-plane it follows, or undefined for a position of its own. */
  planeId: string | undefined;
  /** The geometry as last taken (file's length unit). */
  plane: PlaneDoc;
}

/** A cut-plane of the view as the links see it. */
export interface ListedPlane {
  id: string;
  label: string;
  plane: PlaneDoc;
}

/** Select value for "a position of its own". */
export const OWN_POSITION = '';
/** Select value for "make a new cut-plane". */
export const NEW_PLANE = '+new';

const copy = (p: PlaneDoc): PlaneDoc => JSON.parse(JSON.stringify(p)) as PlaneDoc;

/** Takes the linked plane's current geometry; a link to a plane that is gone keeps its last geometry as its own. */
export function refreshLink(link: PlaneLink, planes: readonly ListedPlane[]): PlaneLink {
  if (link.planeId === undefined) return link;
  const p = planes.find((x) => x.id === link.planeId);
  return p ? { planeId: p.id, plane: copy(p.plane) } : { planeId: undefined, plane: link.plane };
}

/** A link to the cut-plane with exactly this geometry, or a position of its own. */
export function linkFor(plane: PlaneDoc, planes: readonly ListedPlane[]): PlaneLink {
  const key = JSON.stringify(plane);
  const p = planes.find((x) => JSON.stringify(x.plane) === key);
  return { planeId: p?.id, plane: copy(plane) };
}

/** The plane with its normal reversed (a flow split's plane whose normal points into the volume). */
export function reversed(p: PlaneDoc): PlaneDoc {
  return { ...copy(p), normal: [-p.normal[0] + 0, -p.normal[1] + 0, -p.normal[2] + 0] };
}

/** Options of a plane choice: every cut-plane by label, a position of its own when the link has one, a new plane. */
export function planeOptions(planes: readonly ListedPlane[], link: PlaneLink | undefined): Record<string, string> {
  const o: Record<string, string> = {};
  for (const p of planes) o[p.label] = p.id;
  if (link && link.planeId === undefined) o['(its own position)'] = OWN_POSITION;
  o['+ new cut-plane'] = NEW_PLANE;
  return o;
}
