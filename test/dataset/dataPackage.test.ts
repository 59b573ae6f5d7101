import { describe, expect, it } from 'vitest';
import { dataPackage, tableSchema } from '../../src/dataset/dataPackage.ts';
import { FRAME_FIELDS, TOSS_FIELDS, FLAG_CODES } from '../../src/dataset/fields.ts';

// Checks against the Frictionless Data Package, Data Resource, Tabular Data Resource and Table Schema
// specifications (frictionlessdata.io, specs.frictionlessdata.io, v1, 2017); the lists below are from those pages, from memory.
const TABLE_SCHEMA_TYPES = ['string', 'number', 'integer', 'boolean', 'object', 'array', 'date', 'time', 'datetime',
  'year', 'yearmonth', 'duration', 'geopoint', 'geojson', 'any'];
const NAME = /^[a-z0-9._-]+$/; // Data Resource spec: name lower-case alphanumerics plus ".", "_", "-"

interface Res { name: string; path: string; profile: string; format: string; description: string;
  schema: { fields: { name: string; type: string; description: string; unit?: string }[]; missingValues: string[];
    primaryKey: string[]; foreignKeys?: { fields: string[]; reference: { resource: string; fields: string[] } }[] } }

describe('dataPackage', () => {
  const pkg = dataPackage() as { profile: string; name: string; description: string; resources: Res[] };

  it('has the required Data Package keys: a profile and a non-empty resources array with unique valid names', () => {
    expect(pkg.profile).toBe('data-package');
    expect(pkg.name).toMatch(NAME);
    expect(pkg.resources.map((r) => r.name)).toEqual(['tosses', 'frames', 'tosses-parquet', 'frames-parquet']);
    for (const r of pkg.resources) expect(r.name).toMatch(NAME);
  });

  it('each resource has a relative path, a format and a Table Schema whose fields list the field list in order', () => {
    const want = { 'tosses.csv': TOSS_FIELDS, 'frames.csv': FRAME_FIELDS, 'tosses.parquet': TOSS_FIELDS, 'frames.parquet': FRAME_FIELDS };
    for (const r of pkg.resources) {
      expect(Object.keys(want)).toContain(r.path);
      expect(r.format).toBe(r.path.split('.')[1]);
      const fields = want[r.path as keyof typeof want];
      expect(r.schema.fields.map((f) => f.name)).toEqual(fields.map((f) => f.name));
      for (const f of r.schema.fields) {
        expect(TABLE_SCHEMA_TYPES).toContain(f.type);
        expect(f.description.length).toBeGreaterThan(0);
      }
      expect(r.schema.missingValues).toEqual(['']);
    }
    // a tabular-data-resource is CSV in v1; the Parquet copies are plain data resources
    expect(pkg.resources.map((r) => r.profile)).toEqual(['tabular-data-resource', 'tabular-data-resource', 'data-resource', 'data-resource']);
  });

  it('units go both into a unit property and into the description', () => {
    const f = tableSchema(TOSS_FIELDS).fields.find((x) => x.name === 'launch_speed_m_s');
    expect(f?.unit).toBe('m/s');
    expect(f?.description).toMatch(/Unit: m\/s\.$/);
    expect(tableSchema(TOSS_FIELDS).fields.find((x) => x.name === 'status')?.unit).toBeUndefined();
  });

  it('keys: toss_id for tosses, [toss_id, frame] for frames, and frames → tosses of the same format', () => {
    const [tosses, frames, tossesPq, framesPq] = pkg.resources;
    expect(tosses.schema.primaryKey).toEqual(['toss_id']);
    expect(tossesPq.schema.primaryKey).toEqual(['toss_id']);
    expect(frames.schema.primaryKey).toEqual(['toss_id', 'frame']);
    expect(frames.schema.foreignKeys).toEqual([{ fields: ['toss_id'], reference: { resource: 'tosses', fields: ['toss_id'] } }]);
    expect(framesPq.schema.foreignKeys).toEqual([{ fields: ['toss_id'], reference: { resource: 'tosses-parquet', fields: ['toss_id'] } }]);
  });

  it('constraints carry required and enum; booleans declare true/false', () => {
    const status = tableSchema(TOSS_FIELDS).fields.find((x) => x.name === 'status');
    expect(status?.constraints).toEqual({ required: true, enum: ['ok', 'flagged', 'failed'] });
    const detected = tableSchema(FRAME_FIELDS).fields.find((x) => x.name === 'detected');
    expect(detected).toMatchObject({ type: 'boolean', trueValues: ['true'], falseValues: ['false'] });
  });

  it('documents the formula guard and every flag code, and is the same on every call (no dates)', () => {
    expect(pkg.resources[0].description).toMatch(/single quote/);
    for (const f of FLAG_CODES) expect(pkg.description).toContain(f.code);
    expect(JSON.stringify(dataPackage())).toBe(JSON.stringify(pkg));
  });
});
