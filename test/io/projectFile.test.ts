import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { fromBase64, projectFileJson, readProjectFile, toBase64, type Project } from '../../src/io/projectFile.js';

const record = new Uint8Array(readFileSync('survey-examples/pump-station/records/S3.seg2'));
const stations = new TextEncoder().encode('station,x,elev\n1,0,212\n2,2,211.97\n');

function project(): Project {
  return {
    units: 'ft',
    inputs: [
      { name: 'S3.seg2', kind: 'seg2', bytes: record, lengthUnit: 'm' },
      { name: 'stations.csv', kind: 'stations', bytes: stations, lengthUnit: 'm' },
    ],
    picks: [{ file: 'S3.seg2', trace: 12, time: 0.0123 }, { file: 'S3.seg2', trace: 13, time: null }],
    choices: { wave: 'P', segments: { 'S3:forward': 2 }, breakpoints: { 'S3:reverse': [8.5] }, directThroughOrigin: true, poisson: 0.33 },
  };
}

function messageOf(text: string): string {
  try {
    readProjectFile(text, 'line.hammerline.json');
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return (error as Error).message;
  }
  throw new Error('no error');
}

describe('toBase64 / fromBase64', () => {
  it('toBase64 gives what Node\'s Buffer gives (RFC 4648), and fromBase64 inverts it, for every length mod 3', () => {
    // Reference: Node's Buffer base64 encoder, an implementation outside the project.
    for (const length of [0, 1, 2, 3, 4, 5, 1000, record.length]) {
      const bytes = record.subarray(0, length);
      expect(toBase64(bytes)).toBe(Buffer.from(bytes).toString('base64'));
      expect(Buffer.from(fromBase64(toBase64(bytes))!).equals(bytes)).toBe(true);
    }
    expect(fromBase64('abc')).toBeUndefined();
    expect(fromBase64('ab$=')).toBeUndefined();
  });
});

describe('readProjectFile', () => {
  it('readProjectFile(projectFileJson(p)) gives back the same project, bytes and pick times included', () => {
    const back = readProjectFile(projectFileJson(project()), 'line.hammerline.json');
    expect(Buffer.from(back.inputs[0].bytes).equals(record)).toBe(true);
    expect(new TextDecoder().decode(back.inputs[1].bytes)).toBe(new TextDecoder().decode(stations));
    expect(back.picks[0].time).toBeCloseTo(0.0123, 12);
    expect({ ...back, inputs: [] }).toEqual({ ...project(), inputs: [] });
    expect(back.inputs.map((i) => [i.name, i.kind, i.lengthUnit])).toEqual([['S3.seg2', 'seg2', 'm'], ['stations.csv', 'stations', 'm']]);
    expect(JSON.parse(projectFileJson(project())).schema).toBe('hammerline/project@1');
  });

  it('readProjectFile names the field that is wrong, what it found and what it expected', () => {
    const good = JSON.parse(projectFileJson(project()));
    const broken = (change: (doc: any) => void) => { const doc = structuredClone(good); change(doc); return JSON.stringify(doc); };
    expect(messageOf('{"schema": "hammerline/project@1", ')).toMatch(/^line\.hammerline\.json: is not JSON/);
    expect(messageOf(broken((d) => { d.schema = 'hammerline/project@2'; }))).toMatch(/field schema: is "hammerline\/project@2"; expected "hammerline\/project@1" \(a project written by another version/);
    expect(messageOf(broken((d) => { d.inputs[1].kind = 'table'; }))).toMatch(/field inputs\[1\]\.kind: is "table"; expected one of "seg2", "first-breaks", "stations"/);
    expect(messageOf(broken((d) => { d.inputs[0].data = 'not base64!'; }))).toMatch(/field inputs\[0\]\.data: is not base64/);
    expect(messageOf(broken((d) => { delete d.units; }))).toMatch(/field units: is missing; expected one of "m", "ft"/);
    expect(messageOf(broken((d) => { d.picks[1].trace = 0; }))).toMatch(/field picks\[1\]\.trace: is 0; expected a trace number/);
    expect(messageOf(broken((d) => { d.picks[0].file = 'S9.seg2'; }))).toMatch(/field picks\[0\]\.file: is "S9\.seg2"/);
    expect(messageOf(broken((d) => { d.picks[0].time_ms = -1; }))).toMatch(/field picks\[0\]\.time_ms: is -1/);
    expect(messageOf(broken((d) => { d.choices.segments['S3:forward'] = 5; }))).toMatch(/field choices\.segments\["S3:forward"\]: is 5; expected a segment count from 1 to 4/);
    expect(messageOf(broken((d) => { d.choices.breakpoints_m['S3:reverse'] = ['8']; }))).toMatch(/field choices\.breakpoints_m\["S3:reverse"\]\[0\]: is "8"/);
    expect(messageOf(broken((d) => { d.choices.poisson = 0.5; }))).toMatch(/field choices\.poisson: is 0\.5; expected a Poisson's ratio/);
    expect(messageOf(broken((d) => { d.inputs.push({ ...d.inputs[0] }); }))).toMatch(/field inputs\[2\]\.name: "S3\.seg2" is given twice/);
    expect(messageOf(broken((d) => { d.inputs.push({ name: 't.csv', kind: 'first-breaks', length_unit: 'm', encoding: 'utf-8', data: 'x' }); }))).toMatch(/field inputs: holds more than one line/);
  });
});
