import { mkdir, readdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TossRow } from '../../src/dataset/index.ts';
import { UsageError } from '../../src/errors.ts';
import { buildReport, tossesForDetail } from '../../src/report/buildReport.ts';
import { makeStudy, statusOf, type StudyFixture } from './fixtures.ts';
import { externalReferences } from './selfContained.ts';
import { markGroup, paths } from './svgParse.ts';

const EVIL = '<script>alert(1)</script>';

let study: StudyFixture;
let page: string;
let out: string;
beforeAll(async () => {
  // tosser of toss 1 is a script tag; clips for the first 4 tosses (toss 3 is flagged and gets a card)
  study = await makeStudy({ tosses: 20, clips: 4, tosser: (i) => (i === 1 ? EVIL : `T0${(i % 3) + 1}`) });
  out = await buildReport(study.datasetDir, { maxTossesWithDetail: 4, seed: 7 });
  page = await readFile(out, 'utf8');
});
afterAll(() => study.cleanup());

describe('buildReport', () => {
  it('writes <dataset>/report.html by default, atomically (no temporary file left)', async () => {
    expect(out).toBe(join(study.datasetDir, 'report.html'));
    expect((await readdir(study.datasetDir)).filter((n) => n.endsWith('.tmp'))).toEqual([]);
  });

  it('is self-contained: no URL, no script, images only as data: URIs', () => {
    expect(externalReferences(page)).toEqual([]);
    expect(page).toMatch(/<img src="data:image\/png;base64,/);
    expect(externalReferences('<img src="x.png"><script src="a.js"></script> http://a')).toHaveLength(4); // the checker itself can fail
  });

  it('shows a tosser named like a script tag as text', () => {
    expect(page).not.toContain(EVIL);
    expect(page).not.toMatch(/<script/i);
    expect(page).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(page).toContain('the coin was never found &lt;in any frame&gt;'); // a failed toss's error, escaped
  });

  it('draws one point per measured toss in the spin–launch plane', () => {
    const measured = study.tosses.filter((_, i) => statusOf(i) !== 'failed').length;
    expect(measured).toBe(18); // 20 tosses, failed at i = 5, 16
    const start = page.indexOf('id="plane"');
    expect(paths(markGroup(page.slice(start), 'toss_points'))).toHaveLength(measured);
  });

  it('gives the summary with its intervals, labels from the field list, and per-tosser rows', () => {
    for (const text of ['At a glance', 'Landing on the start face', 'Wilson score 95 %', 'exact (Clopper–Pearson) 95 %', 'bootstrap 95 %',
      'spin_rev_s (rev/s)', 'launch_speed_m_s (m/s)', 'flight_time_s (s)', 'pooled rate', 'seed 7']) {
      expect(page).toContain(text);
    }
    expect(page).toContain('<td>T01</td>');
  });

  it('lists flagged cards first, then failed, then ok, up to the limit; strips where clips exist', () => {
    const cards = [...page.matchAll(/<section class="toss (\w+)" id="toss-(\d+)">/g)].map((m) => m[1]);
    expect(cards).toEqual(['flagged', 'flagged', 'flagged', 'failed']); // flagged: 3, 10, 17; failed: 5
    const first = page.slice(page.indexOf('id="toss-0"'), page.indexOf('id="toss-1"'));
    expect(first).toContain('toss003');
    expect((first.match(/<img /g) ?? []).length).toBe(6);
    const second = page.slice(page.indexOf('id="toss-1"'), page.indexOf('id="toss-2"'));
    expect(second).toContain('toss010');
    expect(second).toContain('Clip not found');
  });

  it('says so when the clips folder is missing, and skips the strips', async () => {
    const moved = join(study.root, 'elsewhere.html');
    await rm(study.clipsDir, { recursive: true, force: true });
    await buildReport(study.datasetDir, { out: moved, maxTossesWithDetail: 2 });
    const text = await readFile(moved, 'utf8');
    expect(text).toContain('Clips not found');
    expect(text).not.toContain('<img ');
    await mkdir(study.clipsDir);
  });

  it('rejects a negative or fractional detail count with the shared option message', async () => {
    await expect(buildReport(study.datasetDir, { maxTossesWithDetail: -1 })).rejects.toThrow(UsageError);
    await expect(buildReport(study.datasetDir, { maxTossesWithDetail: 1.5 })).rejects.toThrow(
      'Expected an integer of 0 or more for maxTossesWithDetail but received "1.5"',
    );
  });
});

describe('tossesForDetail', () => {
  it('orders flagged, failed, ok and keeps dataset order within each', () => {
    const rows = ['ok', 'failed', 'flagged', 'ok', 'flagged', 'failed'].map((status, i) => ({ toss_id: `t${i}`, status })) as unknown as TossRow[];
    expect(tossesForDetail(rows, 10).map((r) => r.toss_id)).toEqual(['t2', 't4', 't1', 't5', 't0', 't3']);
    expect(tossesForDetail(rows, 3)).toHaveLength(3);
    expect(tossesForDetail(rows, 0)).toHaveLength(0);
  });
});
