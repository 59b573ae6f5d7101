/**
 * The spin-rate versus launch-speed plane: every measured toss as a point (colour and shape by its predicted
 * side), over the band boundaries of the two-parameter model of a coin flipped about a horizontal diameter and
 * caught at launch height. That coin turns through 2uω/g and changes face when the angle passes (2k+1)π/2, so the
 * boundaries are the hyperbolas u·ω = (2k+1)πg/4 (eq. of the heads/tails bands in [1]); with the spin in rev/s,
 * spin_rev_s = ω/(2π) = (2k+1)g/(8u). Bands with an odd number of face changes are shaded.
 *
 * References:
 * [1] "The probability of heads", American Mathematical Monthly 93(3), 1986, DOI 10.2307/2323340.
 */
import type { TossRow } from '../dataset/index.ts';
import { bandBoundaryOmega } from '../physics/index.ts';
import { columnLabel } from './labels.ts';
import { MAX_PLOT_POINTS, SIDE_COLOURS, SIDE_LABELS, SIDE_SHAPES, renderPlot, thinEvenly, type VegaLiteSpec } from './plots.ts';

/** One toss in the plane. */
export interface PlanePoint {
  readonly tossId: string;
  readonly tosser: string;
  readonly launchSpeedMS: number;
  readonly spinRevS: number;
  /** Legend label of the predicted side ({@link SIDE_LABELS}) or `side not predicted`. */
  readonly side: string;
}

/** One vertex of a band boundary: boundary k (k = 0, 1, …) at launch speed u. */
export interface BoundaryVertex {
  readonly k: number;
  readonly launchSpeedMS: number;
  readonly spinRevS: number;
}

/** Everything the plane plot draws. */
export interface BandPlaneData {
  /** Every measured toss with a launch speed and a spin rate (before thinning). */
  readonly points: readonly PlanePoint[];
  /** Vertices of the boundaries k = 0 … kMax, in order of k then u. */
  readonly boundaries: readonly BoundaryVertex[];
  /** Shaded bands (odd face changes): for each band j, y from boundary 2j to boundary 2j+1 (clipped at the top). */
  readonly shading: readonly { readonly band: number; readonly launchSpeedMS: number; readonly lowRevS: number; readonly highRevS: number }[];
  /** Axis domains: launch speed (m/s) and spin (rev/s). */
  readonly xDomain: readonly [number, number];
  readonly yDomain: readonly [number, number];
}

/** Options of {@link bandPlaneData}. */
export interface BandPlaneOptions {
  /** Gravity in m/s² (the study's; default standard gravity 9.80665). */
  readonly gravityMS2?: number;
  /** Vertices per boundary curve; default 64. */
  readonly verticesPerCurve?: number;
  /** Most boundary curves drawn; default 400. */
  readonly maxCurves?: number;
}

const NOT_PREDICTED = 'side not predicted';
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** The smallest "round" number (1, 2, 2.5 or 5 times a power of ten, in twentieths) at or above v > 0. */
function niceCeil(v: number): number {
  const step = 10 ** Math.floor(Math.log10(v)) / 2;
  return Math.ceil(v / step - 1e-9) * step;
}

/** The predicted side of a toss row, as a legend label. */
function sideOf(row: TossRow): string {
  let same: boolean | null = typeof row.same_side_predicted === 'boolean' ? row.same_side_predicted : null;
  if (same === null && typeof row.predicted_face === 'string' && typeof row.start_face === 'string') {
    same = row.predicted_face === row.start_face;
  }
  return same === null ? NOT_PREDICTED : same ? SIDE_LABELS.same : SIDE_LABELS.other;
}

/**
 * The data of the plane: the points of every measured toss (status ok or flagged, finite launch speed and spin),
 * the boundary curves spin_rev_s = (2k+1)g/(8u) for every k visible in the domain (each sampled at geometrically
 * spaced u from where it enters the top of the plot to the right edge), the shading and the domains.
 */
export function bandPlaneData(tosses: readonly TossRow[], options: BandPlaneOptions = {}): BandPlaneData {
  const g = options.gravityMS2 ?? 9.80665;
  const vertices = options.verticesPerCurve ?? 64;
  const maxCurves = options.maxCurves ?? 400;
  const points: PlanePoint[] = [];
  for (const row of tosses) {
    if (row.status !== 'ok' && row.status !== 'flagged') continue;
    const u = num(row.launch_speed_m_s);
    const spin = num(row.spin_rev_s);
    if (u === null || spin === null) continue;
    points.push({ tossId: String(row.toss_id), tosser: row.tosser === null ? '' : String(row.tosser), launchSpeedMS: u, spinRevS: spin, side: sideOf(row) });
  }
  const uMax = points.reduce((m, p) => Math.max(m, p.launchSpeedMS), 0);
  const spinMax = points.reduce((m, p) => Math.max(m, p.spinRevS), 0);
  const xDomain: [number, number] = [Math.min(0, ...points.map((p) => p.launchSpeedMS)), niceCeil(uMax > 0 ? uMax * 1.05 : 4)];
  const yDomain: [number, number] = [Math.min(0, ...points.map((p) => p.spinRevS)), niceCeil(spinMax > 0 ? spinMax * 1.05 : 50)];
  const [, xMax] = xDomain;
  const [, yMax] = yDomain;
  const spinOn = (k: number, u: number): number => bandBoundaryOmega(k, u, g) / (2 * Math.PI); // rev/s = ω/(2π), ω from u·ω = (2k+1)πg/4 of [1]
  const uEnter = (k: number): number => ((2 * k + 1) * g) / (8 * yMax); // where boundary k crosses the top edge
  const grid = (k: number): number[] => {
    const u0 = uEnter(k);
    return Array.from({ length: vertices }, (_, i) => u0 * (xMax / u0) ** (i / (vertices - 1)));
  };
  const boundaries: BoundaryVertex[] = [];
  let kMax = -1;
  for (let k = 0; k < maxCurves && uEnter(k) < xMax; k++) {
    kMax = k;
    for (const u of grid(k)) boundaries.push({ k, launchSpeedMS: u, spinRevS: spinOn(k, u) });
  }
  const shading: { band: number; launchSpeedMS: number; lowRevS: number; highRevS: number }[] = [];
  for (let j = 0; 2 * j <= kMax; j++) {
    for (const u of grid(2 * j)) {
      shading.push({ band: j, launchSpeedMS: u, lowRevS: Math.min(spinOn(2 * j, u), yMax), highRevS: Math.min(spinOn(2 * j + 1, u), yMax) });
    }
  }
  return { points, boundaries, shading, xDomain, yDomain };
}

/** The Vega-Lite spec of the plane (points thinned evenly beyond `MAX_PLOT_POINTS`). */
export function bandPlaneSpec(data: BandPlaneData, size = { width: 720, height: 440 }): VegaLiteSpec {
  const x = { type: 'quantitative', scale: { domain: data.xDomain, nice: false, zero: false }, title: columnLabel('launch_speed_m_s') };
  const y = { type: 'quantitative', scale: { domain: data.yDomain, nice: false, zero: false }, title: columnLabel('spin_rev_s') };
  const sides: string[] = [SIDE_LABELS.same, SIDE_LABELS.other];
  if (data.points.some((p) => p.side === NOT_PREDICTED)) sides.push(NOT_PREDICTED);
  return {
    width: size.width,
    height: size.height,
    layer: [
      {
        name: 'band_shading',
        data: { values: data.shading },
        mark: { type: 'area', clip: true, color: '#f3e3c3', opacity: 0.55, interpolate: 'monotone' },
        encoding: { x: { ...x, field: 'launchSpeedMS' }, y: { ...y, field: 'lowRevS' }, y2: { field: 'highRevS' }, detail: { field: 'band' } },
      },
      {
        name: 'band_boundaries',
        data: { values: data.boundaries },
        mark: { type: 'line', clip: true, color: '#b9a27a', strokeWidth: 0.8 },
        encoding: { x: { ...x, field: 'launchSpeedMS' }, y: { ...y, field: 'spinRevS' }, detail: { field: 'k' } },
      },
      {
        name: 'toss_points',
        data: { values: thinEvenly(data.points, MAX_PLOT_POINTS) },
        mark: { type: 'point', filled: true, size: 58, opacity: 0.9, stroke: '#ffffff', strokeWidth: 0.6, clip: true },
        encoding: {
          x: { ...x, field: 'launchSpeedMS' },
          y: { ...y, field: 'spinRevS' },
          color: { field: 'side', type: 'nominal', title: 'predicted landing', scale: { domain: sides, range: [SIDE_COLOURS.same, SIDE_COLOURS.other, '#8a8f98'] } },
          shape: { field: 'side', type: 'nominal', title: 'predicted landing', scale: { domain: sides, range: [SIDE_SHAPES.same, SIDE_SHAPES.other, 'square'] } },
          description: { field: 'tossId' },
        },
      },
    ],
  };
}

/**
 * The plane as inline SVG; `shown` is the number of point marks drawn (≤ `MAX_PLOT_POINTS`) out of `total`.
 * The point marks are the `<path>` children of the group with class `toss_points_marks`.
 */
export async function bandPlanePlot(data: BandPlaneData, idPrefix = 'plane'): Promise<{ svg: string; shown: number; total: number }> {
  const svg = await renderPlot(bandPlaneSpec(data), idPrefix);
  return { svg, shown: Math.min(data.points.length, MAX_PLOT_POINTS), total: data.points.length };
}
