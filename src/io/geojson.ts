import type { InterpretationResult } from '../interpret.js';
import type { JobDetails, LonLat } from './jobDetails.js';
import { round } from './numbers.js';
import type { LengthUnit } from '../core/units.js';
import { displayText } from '../report/unitText.js';

/** Mean radius of the Earth, in metres (IUGG mean radius R1 of WGS 84). */
const EARTH_RADIUS = 6371008.8;

/** Digits after the decimal point of a longitude or latitude: 1e-7 degree is about 1 cm. */
const POSITION_DIGITS = 7;

/**
 * Great-circle distance between two WGS 84 positions, in metres, by the haversine formula on a
 * sphere of the Earth's mean radius (within 0.5 % of the ellipsoidal distance).
 */
export function greatCircleDistance(a: LonLat, b: LonLat): number {
  const rad = Math.PI / 180;
  const dLat = (b.lat - a.lat) * rad;
  const dLon = (b.lon - a.lon) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.lat * rad) * Math.cos(b.lat * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_RADIUS * Math.asin(Math.min(1, Math.sqrt(h)));
}

/**
 * WGS 84 position of a point x metres along a straight line from `start` (at x = `x0`) to `end`
 * (at x = `x1`), by linear interpolation of longitude and latitude. Over a seismic line (a few
 * hundred metres) this departs from the geodesic by far less than a millimetre.
 */
export function positionAlong(start: LonLat, end: LonLat, x0: number, x1: number, x: number): [number, number] {
  const f = x1 === x0 ? 0 : (x - x0) / (x1 - x0);
  return [round(start.lon + f * (end.lon - start.lon), POSITION_DIGITS)!, round(start.lat + f * (end.lat - start.lat), POSITION_DIGITS)!];
}

/** Schema name carried in the line feature's properties. */
export const LINE_GEOJSON_SCHEMA = 'hammerline/line-geojson@1';

/**
 * The line as GeoJSON (RFC 7946): a FeatureCollection of one LineString (the line from the first
 * geophone to the last, with the job details, layer velocities and cautions) and one Point per
 * geophone with its position along the line, ground elevation and, for every refractor, the
 * recommended depth below ground, its standard error, the refractor elevation and the method.
 * Positions are [longitude, latitude] in WGS 84 (RFC 7946 §3.1.1, §4), interpolated between the
 * coordinates given for the first and last geophones. Elevations are properties, not a third
 * coordinate: RFC 7946 would read a third coordinate as height above the WGS 84 ellipsoid, and
 * the survey's elevations are on its own datum.
 *
 * The numeric properties are SI, their unit in their names; with `unit` 'ft' the sentences
 * (cautions, warnings) give feet and ft/s with the SI value in brackets.
 *
 * @param receivers - every geophone position and its ground elevation, in metres, sorted along the line
 */
export function lineGeoJson(result: InterpretationResult, receivers: { x: number; elev: number }[], job: JobDetails & { lineStart: LonLat; lineEnd: LonLat }, unit: LengthUnit = 'm'): Record<string, unknown> {
  const x0 = receivers[0].x;
  const x1 = receivers[receivers.length - 1].x;
  const at = (x: number) => positionAlong(job.lineStart, job.lineEnd, x0, x1, x);
  const vs30At = new Map(result.site?.alongLine.map((a) => [a.x, a.vs30]) ?? []);
  const stations = receivers.map((receiver, i) => {
    const properties: Record<string, unknown> = {
      station: i + 1,
      x_m: round(receiver.x, 3),
      ground_elev_m: round(receiver.elev, 3),
    };
    for (const r of result.refractors) {
      const k = r.points.findIndex((p) => p.x === receiver.x);
      const p = k >= 0 ? r.points[k] : undefined;
      properties[`depth_${r.index}_m`] = round(p?.depth, 3);
      properties[`depth_${r.index}_se_m`] = round(p?.depthSe, 3);
      properties[`elev_${r.index}_m`] = round(p?.elev, 3);
      properties[`method_${r.index}`] = p ? r.pointMethods[k] : null;
    }
    if (result.site) {
      properties.vs30_mps = round(vs30At.get(receiver.x), 1);
      properties.vs30_estimated = result.site.estimated;
    }
    return { type: 'Feature', geometry: { type: 'Point', coordinates: at(receiver.x) }, properties };
  });
  const line = {
    type: 'Feature',
    geometry: { type: 'LineString', coordinates: [at(x0), at(x1)] },
    properties: {
      schema: LINE_GEOJSON_SCHEMA,
      name: job.line ?? null,
      site: job.site ?? null,
      client: job.client ?? null,
      project: job.project ?? null,
      survey_date: job.date ?? null,
      wave: result.wave,
      first_x_m: round(x0, 3),
      last_x_m: round(x1, 3),
      geophones: receivers.length,
      elevation_datum: job.elevationDatum ?? null,
      layer_velocities_mps: result.layers.map((l) => round(l.velocity, 1)),
      layer_velocity_ses_mps: result.layers.map((l) => round(l.velocitySe, 1)),
      ...(result.site ? { vs30_mps: round(result.site.vs30, 1), vs30_low_mps: round(result.site.vs30Low, 1), vs30_high_mps: round(result.site.vs30High, 1), vs30_estimated: result.site.estimated } : {}),
      cautions: result.cautions.map((c) => (unit === 'm' ? c.message : displayText(c, unit))),
      warnings: result.warnings.map((w) => (unit === 'm' ? w.message : displayText(w, unit))),
    },
  };
  return { type: 'FeatureCollection', features: [line, ...stations] };
}
