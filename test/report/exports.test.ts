import { readFileSync } from 'node:fs';
import { check, getIssues } from '@placemarkio/check-geojson';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { runReport } from './runReport.js';

const SH = 'survey-examples/alluvial-terrace/sh-first-breaks.csv';
// A line running north-east: 54.7 m east and 44.5 m north between the first and last geophone,
// 70.5 m long like the geophone spread (0 to 70.5 m, survey-examples/alluvial-terrace/README.md).
const START = [7.4312, 46.9487];
const END = [7.4312 + 54.7 / (6371008.8 * Math.PI / 180 * Math.cos(46.9489 * Math.PI / 180)), 46.9487 + 44.5 / (6371008.8 * Math.PI / 180)];
const COORDS = ['--line-start', START.join(','), '--line-end', END.join(','), '--line', 'T-2S'];

/** Haversine distance on the mean-radius sphere, written out here independently of src/io/geojson.ts. */
function metresBetween(a: number[], b: number[]): number {
  const r = Math.PI / 180;
  const h = Math.sin((b[1] - a[1]) * r / 2) ** 2 + Math.cos(a[1] * r) * Math.cos(b[1] * r) * Math.sin((b[0] - a[0]) * r / 2) ** 2;
  return 2 * 6371008.8 * Math.asin(Math.sqrt(h));
}

describe('hammerline report exports', () => {
  const run = runReport(['report', SH, '-o', 'r.html', '--geojson', 'line.geojson', '--depths-csv', 'depths.csv', '--json', 'line.json', ...COORDS]);
  const document = JSON.parse(run.written['line.json']);

  it('report --geojson is valid GeoJSON by @placemarkio/check-geojson (RFC 7946 structure), with no crs member', () => {
    expect(run.code).toBe(0);
    const text = run.written['line.geojson'];
    expect(getIssues(text)).toEqual([]);
    const parsed = check(text) as unknown as { type: string; features: { geometry: { type: string; coordinates: number[] | number[][] }; properties: Record<string, unknown> }[] };
    expect(parsed.type).toBe('FeatureCollection');
    expect(parsed).not.toHaveProperty('crs'); // RFC 7946 §4: WGS 84 always, no crs member
    expect(parsed.features[0].geometry.type).toBe('LineString');
    expect(parsed.features.slice(1).every((f) => f.geometry.type === 'Point')).toBe(true);
    expect(parsed.features.length).toBe(1 + 48); // 48 geophones (survey-examples/README.md)
  });

  it('report --geojson writes positions as [longitude, latitude] (RFC 7946 §3.1.1), interpolated between the line ends', () => {
    const parsed = JSON.parse(run.written['line.geojson']);
    const line = parsed.features[0].geometry.coordinates;
    expect(line[0][0]).toBeCloseTo(START[0], 7); // longitude first
    expect(line[0][1]).toBeCloseTo(START[1], 7);
    expect(line[1][0]).toBeCloseTo(END[0], 7);
    expect(line[1][1]).toBeCloseTo(END[1], 7);
    const stations = parsed.features.slice(1);
    for (const f of stations) {
      const x = f.properties.x_m as number;
      // Distance from the first geophone along the ground equals x - x_first within 1 cm + 0.5 %
      // (the sphere against the ellipsoid; common practice for lines this short).
      expect(Math.abs(metresBetween(START, f.geometry.coordinates) - x)).toBeLessThan(0.01 + 0.005 * x);
    }
    // Depths in the properties are the JSON interpretation's.
    const points = document.refractors[1].points as { x_m: number; depth_m: number; depth_se_m: number; elev_m: number }[];
    for (const p of points) {
      const f = stations.find((s: { properties: { x_m: number } }) => s.properties.x_m === p.x_m);
      expect(f.properties.depth_2_m).toBe(p.depth_m);
      expect(f.properties.depth_2_se_m).toBe(p.depth_se_m);
      expect(f.properties.elev_2_m).toBe(p.elev_m);
    }
  });

  it('report --geojson without the line-end coordinates stops with a message saying what it needs', () => {
    const r = runReport(['report', SH, '-o', 'r.html', '--geojson', 'line.geojson']);
    expect(r.code).toBe(2);
    expect(r.error?.message).toMatch(/--geojson needs the coordinates of the line ends: give --line-start LON,LAT and --line-end LON,LAT/);
    expect(r.written).toEqual({});
  });

  it('report warns when the line-end coordinates are farther apart than the geophones (longitude and latitude swapped)', () => {
    const r = runReport(['report', SH, '-o', 'r.html', '--line-start', `${START[1]},${START[0]}`, '--line-end', `${END[1]},${END[0]}`]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/coordinates given for the line ends are [\d.]+ m apart, but the geophones span 70\.5 m/);
    expect(r.written['r.html']).toMatch(/class="notice">The coordinates given for the line ends/);
  });

  it('report --depths-csv parses back (papaparse) to the JSON interpretation, units in every column name', () => {
    const text = run.written['depths.csv'];
    const lines = text.split('\r\n');
    const headerAt = lines.findIndex((l) => l.startsWith('station,'));
    expect(lines.slice(0, headerAt).every((l) => /^"?#/.test(l))).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(lines.slice(headerAt).join('\n'), { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    for (const name of parsed.meta.fields!) expect(name).toMatch(/^(station|method_\d)$|_m$/);
    expect(parsed.data.length).toBe(48);
    for (const [k, r] of (document.refractors as { points: { x_m: number; depth_m: number; depth_se_m: number; elev_m: number; method: string }[]; by_method: Record<string, { x_m: number; depth_m: number }[]> }[]).entries()) {
      for (const p of r.points) {
        const row = parsed.data.find((d) => Number(d.x_m) === p.x_m)!;
        expect(Number(row[`depth_${k + 1}_m`])).toBe(p.depth_m);
        expect(Number(row[`depth_${k + 1}_se_m`])).toBe(p.depth_se_m);
        expect(Number(row[`elev_${k + 1}_m`])).toBe(p.elev_m);
        expect(row[`method_${k + 1}`]).toBe(p.method);
      }
      for (const q of r.by_method['delay-time']) expect(Number(parsed.data.find((d) => Number(d.x_m) === q.x_m)![`depth_${k + 1}_delay_time_m`])).toBe(q.depth_m);
    }
  });

  it('report --depths-csv has no cell a spreadsheet would run as a formula, even from hostile names (OWASP CSV injection)', () => {
    const hostile = 'source_id,source_x,receiver_x,time_ms\n' + runReportInput();
    const r = runReport(['report', 'hostile.csv', '-o', 'r.html', '--depths-csv', 'd.csv', '--line', '=HYPERLINK("x")', '--site', '@SUM(A1)', '--wave', 'S'], { 'hostile.csv': hostile });
    expect(r.code).toBe(0);
    const cells = Papa.parse<string[]>(r.written['d.csv'], { skipEmptyLines: true }).data.flat();
    for (const cell of cells) {
      // A number may start with a minus sign; any other cell must not start a formula.
      if (/^-?\d+(\.\d+)?$/.test(cell)) continue;
      expect(cell, cell).not.toMatch(/^[=+\-@\t\r]/);
    }
    // The hostile source ids did reach the file (inside warning lines), and the title line carries the hostile line name.
    expect(cells.some((c) => c.includes('=S2+1'))).toBe(true);
    expect(cells.some((c) => c.includes('=HYPERLINK'))).toBe(true);
  });
});

/** The SH example's picks with every source id replaced by formulas, one after a comma (an invented hostile file). */
function runReportInput(): string {
  const text = readFileSync(SH, 'utf8');
  return text.split('\n').filter((l) => /^S\d/.test(l)).map((l) => {
    const [id, sx, , rx, , t] = l.split(',');
    return `"=${id}+1,=2+3",${sx},${rx},${t}`;
  }).join('\n') + '\n';
}
