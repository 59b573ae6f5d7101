/**
 * Builds `report.html` for a measured dataset folder: one self-contained file (inline SVG plots, frame strips as
 * PNG data URIs, inline CSS, no scripts, no URL of any kind), written atomically.
 */
import { mkdir, readFile, stat } from 'node:fs/promises';
import { dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { atomicWriteFile, readFrames, readTosses, type FrameRow, type TossRow } from '../dataset/index.ts';
import { optionError } from '../errors.ts';
import { STANDARD_GRAVITY } from '../physics/index.ts';
import { summarizeStudy } from '../stats/summarize.ts';
import { bandPlaneData, bandPlanePlot } from './bandPlane.ts';
import { frameStrip, type StripImage } from './frameStrip.ts';
import { htmlPage, html, trustedHtml, type SafeHtml } from './html.ts';
import { columnLabel } from './labels.ts';
import { precessionHistogramData, precessionHistogramPlot } from './precessionHistogram.ts';
import { REPORT_CSS } from './styles.ts';
import { poolingSentence, quantileTable, sameSideTable, summaryCards, tosserTable } from './summarySection.ts';
import { tossDetail } from './tossDetail.ts';
import { tossPlotData, tossPlots } from './tossPlots.ts';
import { tosserRatesPlot } from './tosserRates.ts';

/** Options of {@link buildReport}. */
export interface BuildReportOptions {
  /** The report file; default `<datasetDir>/report.html`. Its folder is created if needed. */
  readonly out?: string;
  /** Folder holding the clips (the measure run's input folder); default `options.input` of `run.json`. */
  readonly clipsDir?: string;
  /** Most tosses given a detail card (flagged first, then failed, then ok); default 50; 0 for none. */
  readonly maxTossesWithDetail?: number;
  /** Seed of the summary's bootstrap; default 1 (as `tossmeter summarize`). */
  readonly seed?: number;
  /** Frames in each strip; default 6. */
  readonly stripFrames?: number;
}

/** The parts of `run.json` the report reads (written by `tossmeter measure`; every part optional). */
interface RunRecord {
  tool_version?: string;
  finished_at?: string;
  options?: { input?: string; gravity_m_s2?: number };
  inputs?: { file?: string }[];
}

const STATUS_ORDER: Record<string, number> = { flagged: 0, failed: 1, ok: 2 };

async function readRun(datasetDir: string): Promise<RunRecord> {
  try {
    const parsed: unknown = JSON.parse(await readFile(join(datasetDir, 'run.json'), 'utf8'));
    return typeof parsed === 'object' && parsed !== null ? (parsed as RunRecord) : {};
  } catch {
    return {};
  }
}

const isDir = (p: string): Promise<boolean> => stat(p).then((s) => s.isDirectory(), () => false);
const isFile = (p: string): Promise<boolean> => stat(p).then((s) => s.isFile(), () => false);

/** The clips folder: the option, else the run's input (a folder, or a single clip's folder), from the cwd or the dataset. */
async function findClipsRoot(datasetDir: string, run: RunRecord, clipsDir: string | undefined): Promise<{ root: string | null; looked: string[] }> {
  if (clipsDir !== undefined) return { root: resolve(clipsDir), looked: [resolve(clipsDir)] };
  const input = run.options?.input;
  if (typeof input !== 'string' || input === '') return { root: null, looked: [] };
  const candidates = [...new Set([resolve(input), resolve(datasetDir, input)])];
  for (const c of candidates) {
    if (await isDir(c)) return { root: c, looked: candidates };
    if (await isFile(c)) return { root: dirname(c), looked: candidates };
  }
  return { root: null, looked: candidates };
}

/** The tosses that get a card: flagged, then failed, then ok (dataset order within each), at most `max`. */
export function tossesForDetail(tosses: readonly TossRow[], max: number): TossRow[] {
  return tosses
    .map((t, i) => ({ t, i }))
    .sort((a, b) => (STATUS_ORDER[String(a.t.status)] ?? 3) - (STATUS_ORDER[String(b.t.status)] ?? 3) || a.i - b.i)
    .slice(0, max)
    .map((x) => x.t);
}

async function stripFor(toss: TossRow, frames: readonly FrameRow[], root: string | null, count: number): Promise<readonly StripImage[] | { note: string }> {
  if (toss.status === 'failed') return { note: 'No frames: the clip was not measured.' };
  if (root === null) return { note: 'Clips not found, so no frame strip.' };
  const file = typeof toss.file === 'string' ? resolve(root, toss.file) : null;
  const rel = file === null ? '' : relative(root, file);
  if (file === null || rel.startsWith('..') || isAbsolute(rel)) return { note: 'No frame strip: the clip path lies outside the clips folder.' };
  if (!(await isFile(file))) return { note: `Clip not found at ${file}, so no frame strip.` };
  try {
    const images = await frameStrip(file, frames, { count });
    return images.length > 0 ? images : { note: 'No frame strip: no frame with a fitted ellipse.' };
  } catch (err) {
    return { note: `No frame strip: ${(err as Error).message}` };
  }
}

/**
 * Reads the dataset in `datasetDir` (`tosses`, `frames`, `run.json`), summarises it with `summarizeStudy`, and
 * writes the report. Clips for the frame strips are looked up under `clipsDir` (default: the measure run's input);
 * when they are missing the report says so and leaves the strips out.
 *
 * @returns the absolute path of the written report
 * @throws UsageError for invalid options; DatasetError when the dataset cannot be read
 */
export async function buildReport(datasetDir: string, options: BuildReportOptions = {}): Promise<string> {
  const maxDetail = options.maxTossesWithDetail ?? 50;
  const seed = options.seed ?? 1;
  const stripCount = options.stripFrames ?? 6;
  if (!(Number.isInteger(maxDetail) && maxDetail >= 0)) throw optionError('maxTossesWithDetail', 'an integer of 0 or more', maxDetail);
  if (!(Number.isInteger(seed) && seed >= 0 && seed <= 4294967295)) throw optionError('seed', 'an integer from 0 to 4294967295', seed);
  if (!(Number.isInteger(stripCount) && stripCount >= 1 && stripCount <= 24)) throw optionError('stripFrames', 'an integer from 1 to 24', stripCount);
  const dir = resolve(datasetDir);
  const out = resolve(options.out ?? join(dir, 'report.html'));

  const tosses = await readTosses(dir);
  const frames = await readFrames(dir).catch(() => [] as FrameRow[]);
  const run = await readRun(dir);
  const gravity = typeof run.options?.gravity_m_s2 === 'number' && run.options.gravity_m_s2 > 0 ? run.options.gravity_m_s2 : STANDARD_GRAVITY;
  const summary = summarizeStudy(tosses, { seed });
  const { root, looked } = await findClipsRoot(dir, run, options.clipsDir);
  const clipsFound = root !== null && (await isDir(root));

  const framesByToss = new Map<string, FrameRow[]>();
  for (const f of frames) {
    const id = String(f.toss_id);
    let list = framesByToss.get(id);
    if (!list) framesByToss.set(id, (list = []));
    list.push(f);
  }

  const plane = bandPlaneData(tosses, { gravityMS2: gravity });
  const [planePlot, precessionSvg, tosserSvg] = await Promise.all([
    bandPlanePlot(plane),
    precessionHistogramPlot(precessionHistogramData(tosses)),
    tosserRatesPlot(summary),
  ]);

  const detailed = tossesForDetail(tosses, maxDetail);
  const cards: SafeHtml[] = [];
  for (const [i, toss] of detailed.entries()) {
    const own = framesByToss.get(String(toss.toss_id)) ?? [];
    const [plotsSvg, strip] = await Promise.all([
      own.length > 0 ? tossPlots(tossPlotData(toss, own, gravity), `toss${i}`) : Promise.resolve(null),
      stripFor(toss, own, clipsFound ? root : null, stripCount),
    ]);
    cards.push(tossDetail(toss, `toss-${i}`, { plotsSvg, strip }));
  }

  const pct = Math.round(summary.confidence * 100);
  const thinned = planePlot.shown < planePlot.total ? ` Showing ${planePlot.shown} of ${planePlot.total} tosses, evenly thinned.` : '';
  const clipNotice = detailed.length === 0 || clipsFound
    ? ''
    : html`<div class="notice">Clips not found${looked.length > 0 ? html` (looked in ${looked.join(', ')})` : ''}: the toss cards have no frame strips. Point <code>--clips</code> at the folder that was measured.</div>`;
  const body = html`<header class="masthead"><div class="inner">
<h1>Coin-toss study report</h1>
<p>Dataset <code>${dir}</code>${run.finished_at ? ` · measured ${run.finished_at}` : ''}${run.tool_version ? ` · tossmeter ${run.tool_version}` : ''} · gravity ${gravity} m/s²</p>
<nav class="toc"><a href="#glance">At a glance</a><a href="#start-face">Start face</a><a href="#motion">Motion</a><a href="#tossers">Tossers</a><a href="#plane">Spin and launch speed</a><a href="#precession">Precession</a><a href="#cards">Toss by toss</a></nav>
</div></header>
<main>
<h2 id="glance">At a glance</h2>
${summaryCards(summary)}
<h2 id="start-face">Landing on the start face</h2>
<p class="lead">Recorded landing faces against the start face, and what the fitted rotations predict. Intervals at ${pct} %; the bootstrap uses seed ${summary.seed} and ${summary.bootstrapResamples} resamples${summary.includeFlagged ? ', flagged tosses included' : ''}.</p>
<div class="panel">${sameSideTable(summary)}</div>
<h2 id="motion">Motion of the tosses</h2>
<p class="lead">Quantiles over the measured tosses (ok and flagged).</p>
<div class="panel">${quantileTable(summary)}</div>
<h2 id="tossers">Tossers</h2>
<p class="lead">${poolingSentence(summary)}</p>
${tosserSvg === null ? '' : html`<div class="panel"><figure>${trustedHtml(tosserSvg)}<figcaption>Same-side rate per tosser: observed with its Wilson interval (dark) and partially pooled (blue); dashed lines at 50 % and the pooled mean.</figcaption></figure></div>`}
<div class="panel">${tosserTable(summary)}</div>
<h2 id="plane">Spin against launch speed</h2>
<div class="panel"><figure>${trustedHtml(planePlot.svg)}<figcaption>Each measured toss at its ${columnLabel('launch_speed_m_s')} and ${columnLabel('spin_rev_s')}, marked by the side the fitted rotation predicts (blue circles: the start face; orange triangles: the other face). Curves: the band boundaries spin = (2k+1)·g / (8·u) of a coin flipped about a horizontal diameter and caught at launch height; in the shaded bands that coin turns over an odd number of times ("The probability of heads", American Mathematical Monthly 93(3), 1986).${thinned}</figcaption></figure></div>
<h2 id="precession">Precession angles</h2>
<div class="panel"><figure>${trustedHtml(precessionSvg)}<figcaption>Histogram of ${columnLabel('precession_deg')} over the measured tosses (bars, left axis). Line, right axis: the probability of landing on the start face for a coin whose axis starts vertical, 1/2 + arcsin(cot² ψ)/π above 45°, 1 below ("Dynamical bias in the coin toss", SIAM Review 49(2), 2007).</figcaption></figure></div>
<h2 id="cards">Toss by toss</h2>
<p class="lead">${detailed.length === 0 ? 'No toss cards (none asked for).' : `${detailed.length} of ${tosses.length} tosses, flagged first, then failed, then ok. Plots: the track of the ellipse centre, the axis ratio against the fitted rotation, the height against the flight parabola; the shaded span is the flight. Strips: frames cropped around the coin with the fitted ellipse.`}</p>
${clipNotice}
${cards}
<footer>Written by tossmeter from ${dir}. Self-contained: no scripts, no network.</footer>
</main>`;
  await mkdir(dirname(out), { recursive: true });
  await atomicWriteFile(out, htmlPage({ title: `Coin-toss study report: ${dir}`, css: REPORT_CSS, body }));
  return out;
}
