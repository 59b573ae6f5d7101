/**
 * The report in a real browser (Debian's Chromium through playwright-core): it opens from file:// with no console
 * error and no request beyond the file itself, every frame strip image decodes, the scatter has one point mark per
 * measured toss, and a screenshot is saved for a human to look at.
 * Skipped only when TOSSMETER_SKIP_BROWSER=1; a missing Chromium fails with a message (CI installs it).
 */
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildReport } from '../../src/report/index.ts';
import { makeStudy, statusOf, type StudyFixture } from '../report/fixtures.ts';

const CHROMIUM = '/usr/bin/chromium';
const skip = process.env.TOSSMETER_SKIP_BROWSER === '1';

let study: StudyFixture;
let browser: Browser;
let shots: string;
let report: string;

describe.skipIf(skip)('report in Chromium', () => {
  beforeAll(async () => {
    if (!existsSync(CHROMIUM)) {
      throw new Error(`${CHROMIUM} is missing: the report's browser test needs Debian's Chromium (.ci/run installs it: apt-get install chromium). Set TOSSMETER_SKIP_BROWSER=1 to skip this test locally.`);
    }
    study = await makeStudy({ tosses: 26, clips: 4 });
    report = await buildReport(study.datasetDir, { maxTossesWithDetail: 4 });
    shots = await mkdtemp(join(tmpdir(), 'tossmeter-report-shots-'));
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
        '--disable-component-update', '--disable-sync'],
    });
  });
  afterAll(async () => {
    await browser?.close();
    await study?.cleanup();
  });

  it('opens with no console error and no request, shows every measured toss and the strips', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 }, deviceScaleFactor: 1 });
    const problems: string[] = [];
    const requests: string[] = [];
    page.on('console', (m) => { if (m.type() === 'error' || m.type() === 'warning') problems.push(`console ${m.type()}: ${m.text()}`); });
    page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
    page.on('requestfailed', (r) => problems.push(`request failed: ${r.url()}`));
    page.on('request', (r) => { if (!r.url().startsWith('data:')) requests.push(r.url()); });
    const url = pathToFileURL(report).href;
    const response = await page.goto(url, { waitUntil: 'load' });
    expect(response?.ok() ?? true).toBe(true);
    expect(problems).toEqual([]);
    expect(requests).toEqual([url]);

    const measured = study.tosses.filter((_, i) => statusOf(i) !== 'failed').length;
    expect(measured).toBe(24); // 26 tosses, failed at i = 5, 16
    expect(await page.locator('g.toss_points_marks > path').count()).toBe(measured);
    expect(await page.locator('section.toss').count()).toBe(4);
    const sizes = await page.locator('.strip img').evaluateAll((imgs) => imgs.map((i) => (i as unknown as { naturalWidth: number }).naturalWidth));
    expect(sizes.length).toBeGreaterThanOrEqual(6);
    expect(sizes.every((w) => w === 300)).toBe(true);
    // the plane is wide enough to read on this screen
    const box = await page.locator('#plane + .panel svg').boundingBox();
    expect(box!.width).toBeGreaterThan(600);

    const file = join(shots, 'report.png');
    await page.screenshot({ path: file, fullPage: true });
    console.log(`report screenshot: ${file}`);
    await page.close();
  });

  afterAll(async () => {
    if (process.env.TOSSMETER_KEEP_SHOTS !== '1' && shots) await rm(shots, { recursive: true, force: true });
  });
});
