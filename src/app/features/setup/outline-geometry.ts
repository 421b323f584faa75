import { plotFields } from '../../../../shared/model/site-layout';
import { issuesByField } from './record-fields';

/** A vertex as Leaflet holds it: latitude first. GeoJSON stores [longitude, latitude]. */
export interface Vertex {
  lat: number;
  lng: number;
}

export type Outline = { type: 'Polygon'; coordinates: [number, number][][] };

/** The plot schema's own outline rule (a GeoJSON Polygon), so messages match the server's. */
const outlineSchema = plotFields.shape.outline.unwrap().unwrap();

/** Fewest distinct corners of a polygon. */
export const MIN_VERTICES = 3;

/** The drawn corners as a GeoJSON Polygon: one exterior ring, closed by repeating the first position (RFC 7946 §3.1.6). */
export function toOutline(vertices: readonly Vertex[]): Outline | null {
  if (vertices.length < MIN_VERTICES) return null;
  const ring = vertices.map((v) => [round(v.lng), round(v.lat)] as [number, number]);
  return { type: 'Polygon', coordinates: [[...ring, ring[0]!]] };
}

/** The exterior ring's corners, without the closing repeat, for drawing and editing. */
export function toVertices(outline: unknown): Vertex[] {
  const ring = (outline as Outline | null)?.coordinates?.[0];
  if (!Array.isArray(ring)) return [];
  const corners = ring.map(([lng, lat]) => ({ lat, lng }));
  const [first, last] = [corners[0], corners[corners.length - 1]];
  if (corners.length > 1 && first && last && first.lat === last.lat && first.lng === last.lng) corners.pop();
  return corners;
}

export type ParsedOutline = { outline: Outline; errors?: undefined } | { outline?: undefined; errors: string[] };

/**
 * Typed or pasted GeoJSON: a Polygon geometry (or a Feature holding one). Checked with the plot
 * schema first, then as a linear ring per RFC 7946 §3.1.6 (at least four positions, first equals
 * last) and in WGS84 degrees, because the map draws it over the collars' latitude and longitude.
 */
export function parseOutline(text: string): ParsedOutline {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return { errors: ['This is not JSON: check brackets, commas and quotes'] };
  }
  const geometry =
    (json as { type?: unknown; geometry?: unknown } | null)?.type === 'Feature' ? (json as { geometry: unknown }).geometry : json;
  const type = (geometry as { type?: unknown } | null)?.type;
  // The schema would also complain about every position of a line; the kind is the one problem to name.
  if (type !== 'Polygon') return { errors: [`The outline must be a GeoJSON Polygon${typeof type === 'string' ? `, not a ${type}` : ''}`] };
  // Ring problems first, in words a person can act on; the shared schema (the rule on the server
  // too) then checks everything else.
  const rings = (geometry as { coordinates?: unknown }).coordinates;
  const errors = Array.isArray(rings) ? ringProblems(rings as [number, number][][]) : [];
  if (errors.length) return { errors };
  const check = outlineSchema.safeParse(geometry);
  if (!check.success) {
    return {
      errors: Object.entries(issuesByField(check.error.issues)).map(([path, msg]) => (path === '(form)' ? msg : `${path}: ${msg}`)),
    };
  }
  return { outline: check.data as Outline };
}

function ringProblems(rings: [number, number][][]): string[] {
  // Positions that are not number pairs are the schema's to name, in its own words.
  const pair = (p: unknown) => Array.isArray(p) && p.length === 2 && p.every((v) => typeof v === 'number');
  if (!rings.every((r) => Array.isArray(r) && r.every(pair))) return [];
  const errors: string[] = [];
  if (rings.length === 0) errors.push('The polygon has no ring');
  // A plot is one area: the editor keeps the outer ring only, so holes would be lost silently.
  if (rings.length > 1) errors.push('A plot outline is one ring without holes');
  rings.forEach((ring, i) => {
    const name = i === 0 ? 'The outer ring' : `Hole ${i}`;
    if (ring.length < 4) errors.push(`${name} needs at least 4 positions (3 corners and the first again)`);
    const [a, z] = [ring[0], ring[ring.length - 1]];
    if (a && z && (a[0] !== z[0] || a[1] !== z[1])) errors.push(`${name} must end where it starts`);
    if (ring.some(([lng, lat]) => Math.abs(lng) > 180 || Math.abs(lat) > 90)) {
      errors.push(`${name} has a position outside longitude −180…180 / latitude −90…90 (positions are [longitude, latitude])`);
    }
  });
  return errors;
}

/** Pretty GeoJSON for the text box: one position a line keeps long rings readable. */
export function outlineText(outline: Outline | null): string {
  if (!outline) return '';
  const ring = (r: [number, number][]) => `[\n      ${r.map((p) => JSON.stringify(p)).join(',\n      ')}\n    ]`;
  return `{\n  "type": "Polygon",\n  "coordinates": [\n    ${outline.coordinates.map(ring).join(',\n    ')}\n  ]\n}`;
}

/** 1e-7° is about 1 cm: finer digits are noise from the pointer, not survey precision. */
function round(x: number): number {
  return Math.round(x * 1e7) / 1e7;
}
