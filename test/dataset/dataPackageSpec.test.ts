/**
 * The written datapackage.json against the rules of the Frictionless Data Package and Table Schema
 * specifications, v1, frictionlessdata.io (specs.frictionlessdata.io: Data Package, Data Resource, Tabular Data
 * Resource, Table Schema, CSV Dialect; 2017). The rules below were taken from the v1 JSON Schema profiles as the
 * frictionlessdata project ships them (`data-package.json`, `data-resource.json`, `tabular-data-resource.json`
 * in the datapackage-js library's `src/profiles/`), read through the search tool; the rules marked "(spec
 * text, from memory)" come from the specification pages as remembered, not from those files.
 *
 * `specProblems` is a small validator written for this test (no JSON Schema library is installed); it is checked
 * first on broken descriptors, one per rule, so that an empty problem list for ours means something.
 */
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dataPackage, writeDataset } from '../../src/dataset/index.ts';
import { sampleFrames, sampleTosses } from './fixtures.ts';

type Json = unknown;
type Obj = Record<string, Json>;

/** Table Schema v1 field types (tabular-data-resource.json, schema.fields.items.anyOf). */
const FIELD_TYPES = ['string', 'number', 'integer', 'date', 'time', 'datetime', 'year', 'yearmonth', 'boolean', 'object', 'geopoint', 'geojson', 'array', 'duration', 'any'];

/** Constraint keys allowed for each field type (the `constraints.properties` of each field kind in the profile). */
const CONSTRAINTS: Record<string, string[]> = {
  string: ['required', 'unique', 'pattern', 'enum', 'minLength', 'maxLength'],
  number: ['required', 'unique', 'pattern', 'enum', 'minimum', 'maximum'],
  integer: ['required', 'unique', 'pattern', 'enum', 'minimum', 'maximum'],
  boolean: ['required', 'enum'],
  date: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  time: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  datetime: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  year: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  yearmonth: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  duration: ['required', 'unique', 'enum', 'minimum', 'maximum'],
  object: ['required', 'unique', 'enum', 'minLength', 'maxLength'],
  array: ['required', 'unique', 'enum', 'minLength', 'maxLength'],
  geojson: ['required', 'unique', 'enum', 'minLength', 'maxLength'],
  geopoint: ['required', 'unique', 'enum'],
  any: ['required', 'unique', 'enum'],
};

/** `format` values allowed where the profile gives a closed list. */
const FORMATS: Record<string, string[]> = {
  string: ['default', 'email', 'uri', 'binary', 'uuid'],
  number: ['default'], integer: ['default'], object: ['default'], array: ['default'],
  geopoint: ['default', 'array', 'object'], geojson: ['default', 'topojson'],
};

/** Resource and package names: lower-case alphanumerics and `.`, `_`, `-` (the profile also admits `/`; we do not use it). */
const NAME = /^[a-z0-9._-]+$/;

const isObj = (v: Json): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const isStrings = (v: Json): v is string[] => Array.isArray(v) && v.every((x) => typeof x === 'string');
const names = (v: Json): string[] | null => (typeof v === 'string' ? [v] : isStrings(v) ? v : null);

function enumItemsOk(type: string, items: Json[]): boolean {
  const is = (t: string) => (x: Json) => typeof x === t;
  if (type === 'boolean') return items.every(is('boolean')); // boolean field: enum of booleans
  if (type === 'number') return items.every(is('string')) || items.every(is('number'));
  if (type === 'integer') return items.every(is('string')) || items.every((x) => Number.isInteger(x));
  if (type === 'string' || FORMATS[type] === undefined) return items.every(is('string')) || type === 'any';
  return true;
}

function fieldProblems(f: Json, where: string): string[] {
  if (!isObj(f)) return [`${where}: not an object`];
  const out: string[] = [];
  if (typeof f.name !== 'string' || f.name === '') out.push(`${where}: name is required (a string)`);
  const type = f.type === undefined ? 'string' : f.type; // only the string field kind may omit type
  if (typeof type !== 'string' || !FIELD_TYPES.includes(type)) return [...out, `${where}: type ${JSON.stringify(f.type)} is not a Table Schema type`];
  for (const key of ['title', 'description', 'rdfType'] as const) if (f[key] !== undefined && typeof f[key] !== 'string') out.push(`${where}: ${key} must be a string`);
  if (f.format !== undefined && FORMATS[type] && !FORMATS[type].includes(String(f.format))) out.push(`${where}: format ${JSON.stringify(f.format)} not allowed for ${type}`);
  if (type === 'boolean') {
    for (const key of ['trueValues', 'falseValues'] as const) {
      const v = f[key];
      if (v !== undefined && !(isStrings(v) && v.length >= 1)) out.push(`${where}: ${key} must be a non-empty array of strings`);
    }
  }
  if (f.constraints !== undefined) {
    const c = f.constraints;
    if (!isObj(c)) return [...out, `${where}: constraints must be an object`];
    for (const key of Object.keys(c)) if (!CONSTRAINTS[type].includes(key)) out.push(`${where}: constraint ${key} not allowed for ${type}`);
    for (const key of ['required', 'unique'] as const) if (c[key] !== undefined && typeof c[key] !== 'boolean') out.push(`${where}: constraints.${key} must be a boolean`);
    for (const key of ['minLength', 'maxLength'] as const) if (c[key] !== undefined && !Number.isInteger(c[key])) out.push(`${where}: constraints.${key} must be an integer`);
    if (c.pattern !== undefined && typeof c.pattern !== 'string') out.push(`${where}: constraints.pattern must be a string`);
    if (c.enum !== undefined) {
      const e = c.enum;
      if (!Array.isArray(e) || e.length === 0) out.push(`${where}: constraints.enum must be a non-empty array`);
      else if (new Set(e.map((x) => JSON.stringify(x))).size !== e.length) out.push(`${where}: constraints.enum items must be unique`);
      else if (!enumItemsOk(type, e)) out.push(`${where}: constraints.enum items have the wrong type for ${type}`);
    }
  }
  return out;
}

function schemaProblems(s: Json, where: string, resources: Map<string, Obj>): string[] {
  if (!isObj(s)) return [`${where}: schema must be an object`];
  if (!Array.isArray(s.fields) || s.fields.length === 0) return [`${where}: fields must be a non-empty array`];
  const out = s.fields.flatMap((f, i) => fieldProblems(f, `${where}.fields[${i}]`));
  const fieldNames = s.fields.map((f) => (isObj(f) ? f.name : undefined));
  // (spec text, from memory) field names should be unique; keys below refer to fields by name, so we require it.
  if (new Set(fieldNames).size !== fieldNames.length) out.push(`${where}: field names are not unique`);
  if (s.primaryKey !== undefined) {
    const pk = names(s.primaryKey);
    if (!pk || pk.length === 0 || new Set(pk).size !== pk.length) out.push(`${where}: primaryKey must be a field name or a non-empty array of unique names`);
    else for (const n of pk) if (!fieldNames.includes(n)) out.push(`${where}: primaryKey names unknown field ${n}`);
  }
  if (s.foreignKeys !== undefined) {
    if (!Array.isArray(s.foreignKeys) || s.foreignKeys.length === 0) out.push(`${where}: foreignKeys must be a non-empty array`);
    else s.foreignKeys.forEach((fk, i) => {
      const at = `${where}.foreignKeys[${i}]`;
      if (!isObj(fk) || !isObj(fk.reference)) return void out.push(`${at}: needs fields and reference {resource, fields}`);
      const local = names(fk.fields);
      const remote = names(fk.reference.fields);
      if (!local || !remote || typeof fk.reference.resource !== 'string') return void out.push(`${at}: needs fields and reference {resource, fields}`);
      if (typeof fk.fields !== typeof fk.reference.fields || local.length !== remote.length) out.push(`${at}: fields and reference.fields differ in shape`);
      for (const n of local) if (!fieldNames.includes(n)) out.push(`${at}: unknown local field ${n}`);
      // resource "" is this resource itself
      const target = fk.reference.resource === '' ? { schema: s } : resources.get(fk.reference.resource);
      if (!target) return void out.push(`${at}: reference.resource ${JSON.stringify(fk.reference.resource)} is not in the package`);
      const targetFields = isObj(target.schema) && Array.isArray(target.schema.fields) ? target.schema.fields.map((f) => (isObj(f) ? f.name : undefined)) : [];
      for (const n of remote) if (!targetFields.includes(n)) out.push(`${at}: reference field ${n} is not in ${fk.reference.resource}`);
    });
  }
  if (s.missingValues !== undefined && !(isStrings(s.missingValues) && s.missingValues.length >= 1)) out.push(`${where}: missingValues must be a non-empty array of strings`);
  return out;
}

/** Every rule broken by `pkg`, as readable lines; empty when the descriptor follows the rules. */
function specProblems(pkg: Json): string[] {
  if (!isObj(pkg)) return ['package: not an object'];
  const out: string[] = [];
  if (pkg.name !== undefined && !(typeof pkg.name === 'string' && NAME.test(pkg.name))) out.push(`package: name ${JSON.stringify(pkg.name)} is not lower-case [a-z0-9._-]`);
  for (const key of ['profile', 'title', 'description'] as const) if (pkg[key] !== undefined && typeof pkg[key] !== 'string') out.push(`package: ${key} must be a string`);
  if (!Array.isArray(pkg.resources) || pkg.resources.length === 0) return [...out, 'package: resources must be a non-empty array'];
  const byName = new Map<string, Obj>();
  for (const r of pkg.resources) if (isObj(r) && typeof r.name === 'string') byName.set(r.name, r);
  pkg.resources.forEach((r, i) => {
    const where = `resources[${i}]`;
    if (!isObj(r)) return void out.push(`${where}: not an object`);
    if (typeof r.name !== 'string' || !NAME.test(r.name)) out.push(`${where}: name ${JSON.stringify(r.name)} is required, lower-case [a-z0-9._-]`);
    if ((r.path === undefined) === (r.data === undefined)) out.push(`${where}: exactly one of path and data is required`);
    if (r.path !== undefined) {
      const paths = names(r.path);
      if (!paths || paths.length === 0) out.push(`${where}: path must be a string or a non-empty array of strings`);
      // (spec text, from memory) a file path is relative POSIX, must not be absolute nor climb with "..".
      else for (const p of paths) if (p.startsWith('/') || p.split('/').includes('..')) out.push(`${where}: path ${p} must be relative without ".."`);
    }
    for (const key of ['profile', 'title', 'description', 'format', 'mediatype', 'encoding'] as const) if (r[key] !== undefined && typeof r[key] !== 'string') out.push(`${where}: ${key} must be a string`);
    if (r.profile === 'tabular-data-resource' && r.schema === undefined) out.push(`${where}: a tabular-data-resource needs a schema`);
    if (r.dialect !== undefined) {
      const d = r.dialect;
      if (!isObj(d) || typeof d.delimiter !== 'string' || typeof d.doubleQuote !== 'boolean') out.push(`${where}: dialect needs delimiter (string) and doubleQuote (boolean)`);
      else {
        for (const key of ['lineTerminator', 'quoteChar'] as const) if (d[key] !== undefined && typeof d[key] !== 'string') out.push(`${where}: dialect.${key} must be a string`);
        if (d.header !== undefined && typeof d.header !== 'boolean') out.push(`${where}: dialect.header must be a boolean`);
      }
    }
    if (r.schema !== undefined) out.push(...schemaProblems(r.schema, `${where}.schema`, byName));
  });
  // (spec text, from memory) resource names MUST be unique within a package.
  const resourceNames = pkg.resources.map((r) => (isObj(r) ? r.name : undefined));
  if (new Set(resourceNames).size !== resourceNames.length) out.push('package: resource names are not unique');
  return out;
}

/** A deep copy of our descriptor with one change applied. */
function broken(change: (pkg: { resources: Obj[] } & Obj) => void): Json {
  const pkg = structuredClone(dataPackage()) as { resources: Obj[] } & Obj;
  change(pkg);
  return pkg;
}
const schemaOf = (pkg: { resources: Obj[] }, i: number) => pkg.resources[i].schema as { fields: Obj[] } & Obj;

describe('specProblems (the test validator) catches each rule broken on purpose', () => {
  it.each([
    ['no resources', (p: { resources: Obj[] } & Obj) => void delete (p as Obj).resources, 'package: resources must be a non-empty array'],
    ['empty resources', (p: { resources: Obj[] }) => void (p.resources = []), 'package: resources must be a non-empty array'],
    ['upper-case resource name', (p: { resources: Obj[] }) => void (p.resources[0].name = 'Tosses'), 'resources[0]: name "Tosses" is required, lower-case [a-z0-9._-]'],
    ['resource without a name', (p: { resources: Obj[] }) => void delete p.resources[1].name, 'resources[1]: name undefined is required, lower-case [a-z0-9._-]'],
    ['resource without path or data', (p: { resources: Obj[] }) => void delete p.resources[0].path, 'resources[0]: exactly one of path and data is required'],
    ['absolute path', (p: { resources: Obj[] }) => void (p.resources[0].path = '/etc/tosses.csv'), 'resources[0]: path /etc/tosses.csv must be relative without ".."'],
    ['duplicate resource names', (p: { resources: Obj[] }) => void (p.resources[1].name = 'tosses'), 'package: resource names are not unique'],
    ['field without a name', (p: { resources: Obj[] }) => void delete schemaOf(p, 0).fields[0].name, 'resources[0].schema.fields[0]: name is required (a string)'],
    ['unknown type', (p: { resources: Obj[] }) => void (schemaOf(p, 0).fields[6].type = 'float'), 'resources[0].schema.fields[6]: type "float" is not a Table Schema type'],
    ['minimum on a string', (p: { resources: Obj[] }) => void (schemaOf(p, 0).fields[0].constraints = { minimum: 1 }), 'resources[0].schema.fields[0]: constraint minimum not allowed for string'],
    ['string enum on a boolean', (p: { resources: Obj[] }) => void (schemaOf(p, 1).fields[3].constraints = { enum: ['true'] }), 'resources[1].schema.fields[3]: constraints.enum items have the wrong type for boolean'],
    ['required as text', (p: { resources: Obj[] }) => void (schemaOf(p, 0).fields[0].constraints = { required: 'yes' }), 'resources[0].schema.fields[0]: constraints.required must be a boolean'],
    ['empty enum', (p: { resources: Obj[] }) => void (schemaOf(p, 0).fields[3].constraints = { enum: [] }), 'resources[0].schema.fields[3]: constraints.enum must be a non-empty array'],
    ['primary key on an unknown field', (p: { resources: Obj[] }) => void (schemaOf(p, 0).primaryKey = ['tossid']), 'resources[0].schema: primaryKey names unknown field tossid'],
    ['foreign key to a missing resource', (p: { resources: Obj[] }) => void ((schemaOf(p, 1).foreignKeys as Obj[])[0].reference = { resource: 'throws', fields: ['toss_id'] }), 'resources[1].schema.foreignKeys[0]: reference.resource "throws" is not in the package'],
    ['foreign key to a missing field', (p: { resources: Obj[] }) => void ((schemaOf(p, 1).foreignKeys as Obj[])[0].reference = { resource: 'tosses', fields: ['id'] }), 'resources[1].schema.foreignKeys[0]: reference field id is not in tosses'],
    ['missingValues not strings', (p: { resources: Obj[] }) => void (schemaOf(p, 0).missingValues = [null]), 'resources[0].schema: missingValues must be a non-empty array of strings'],
    ['dialect without doubleQuote', (p: { resources: Obj[] }) => void (p.resources[0].dialect = { delimiter: ',' }), 'resources[0]: dialect needs delimiter (string) and doubleQuote (boolean)'],
    ['trueValues not an array', (p: { resources: Obj[] }) => void (schemaOf(p, 1).fields[3].trueValues = 'true'), 'resources[1].schema.fields[3]: trueValues must be a non-empty array of strings'],
  ])('%s', (_label, change, problem) => {
    expect(specProblems(broken(change as (p: { resources: Obj[] } & Obj) => void))).toContain(problem);
  });
});

describe('datapackage.json follows the Frictionless v1 rules', () => {
  let dir = '';
  let written: Obj;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'tossmeter-dpspec-'));
    await writeDataset(dir, { tosses: sampleTosses(), frames: sampleFrames(), run: {} });
    written = JSON.parse(await readFile(join(dir, 'datapackage.json'), 'utf8')) as Obj;
  });
  afterAll(() => rm(dir, { recursive: true, force: true }));

  it('the descriptor written to disk has no problems', () => {
    expect(specProblems(written)).toEqual([]);
  });

  it('the test fixture is what we think: frames field 3 is the boolean "detected", tosses field 6 a number', () => {
    const res = written.resources as { schema: { fields: { name: string; type: string }[] } }[];
    expect(res[1].schema.fields[3]).toMatchObject({ name: 'detected', type: 'boolean' });
    expect(res[0].schema.fields[6].type).toBe('number');
  });

  it('every resource path names a file that exists in the dataset folder', async () => {
    for (const r of written.resources as { path: string }[]) expect((await stat(join(dir, r.path))).isFile(), r.path).toBe(true);
  });

  it('every field is typed with one of the four types the dataset uses, and required fields carry constraints.required', () => {
    for (const r of written.resources as { schema: { fields: { type: string; constraints?: { required?: boolean } }[]; primaryKey: string[] } }[]) {
      for (const f of r.schema.fields) expect(['string', 'number', 'integer', 'boolean']).toContain(f.type);
      // (Table Schema v1 text, from memory) primary-key fields imply required; we state it explicitly.
      for (const name of r.schema.primaryKey) {
        expect((r.schema.fields as unknown as { name: string; constraints?: { required?: boolean } }[]).find((f) => f.name === name)?.constraints?.required).toBe(true);
      }
    }
  });
});
