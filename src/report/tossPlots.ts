/**
 * The per-toss quality plots, one SVG each (the page sets them side by side): the track (cx and cy of the ellipse centre against time,
 * the flight window shaded), the axis ratio per frame against the fitted rotation's `model_axis_ratio`, and the
 * flight (height of the centre above its release point against time, with the parabola u·τ − g·τ²/2 that the
 * toss's launch speed implies; ballistic flight, common practice, no source).
 */
import type { FrameRow, TossRow } from '../dataset/index.ts';
import { columnLabel } from './labels.ts';
import { MAX_PLOT_POINTS, renderPlot, thinEvenly, type VegaLiteSpec } from './plots.ts';

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const TRACK_COLOURS = ['#5b6883', '#CC79A7'] as const;
const WINDOW_FILL = '#e4f0e8';

/** A frame's time in s: `t_s`, else frame / capture_fps, else null. */
function frameTimeS(frame: FrameRow, captureFps: number | null): number | null {
  const t = num(frame.t_s);
  if (t !== null) return t;
  const f = num(frame.frame);
  return f !== null && captureFps !== null && captureFps > 0 ? f / captureFps : null;
}

/** What the three plots draw, computed from one toss row and its frames (no fitting except the height offset). */
export interface TossPlotData {
  /** True when times are seconds; false when only frame numbers are known (x is then the frame). */
  readonly timeInSeconds: boolean;
  /** The flight window [release, catch] in the x unit, when known. */
  readonly window: { readonly start: number; readonly end: number } | null;
  /** Centre positions: one row per detected frame and coordinate. */
  readonly track: readonly { readonly t: number; readonly coord: string; readonly px: number; readonly inFlight: boolean }[];
  /** Axis ratio per detected frame, and the model's value where the fit gave one. */
  readonly ratio: readonly { readonly t: number; readonly observed: number | null; readonly model: number | null; readonly inFlight: boolean }[];
  /** Height of the centre above release (m), per detected frame, shifted so that its in-flight mean matches the parabola's. */
  readonly height: readonly { readonly t: number; readonly heightM: number; readonly inFlight: boolean }[] | null;
  /** The parabola u·τ − g·τ²/2 over the flight, 64 vertices. */
  readonly parabola: readonly { readonly t: number; readonly heightM: number }[] | null;
}

/**
 * Builds the plot data of one toss. `frames` are that toss's frame rows (any order). The height uses the image's
 * up direction (sin ρ, −cos ρ) for camera roll ρ (`camera_roll_deg`, 0 when unknown) and `px_per_m`; the
 * height offset is the only number fitted here (the mean difference to the parabola over the flight frames).
 *
 * @param gravityMS2 - gravity of the study in m/s²
 */
export function tossPlotData(toss: TossRow, frames: readonly FrameRow[], gravityMS2: number): TossPlotData {
  const fps = num(toss.capture_fps);
  const sorted = [...frames].sort((a, b) => (num(a.frame) ?? 0) - (num(b.frame) ?? 0));
  const timeInSeconds = sorted.every((f) => frameTimeS(f, fps) !== null);
  const xOf = (f: FrameRow): number => (timeInSeconds ? frameTimeS(f, fps)! : (num(f.frame) ?? 0));
  const release = num(toss.release_t_s);
  const flightS = num(toss.flight_time_s);
  const catchS = num(toss.catch_t_s) ?? (release !== null && flightS !== null ? release + flightS : null);
  const window = timeInSeconds && release !== null && catchS !== null ? { start: release, end: catchS } : null;
  const detected = thinEvenly(sorted.filter((f) => f.detected === true && num(f.cx_px) !== null && num(f.cy_px) !== null), MAX_PLOT_POINTS / 2);
  const track = detected.flatMap((f) => [
    { t: xOf(f), coord: 'cx_px', px: num(f.cx_px)!, inFlight: f.in_flight === true },
    { t: xOf(f), coord: 'cy_px', px: num(f.cy_px)!, inFlight: f.in_flight === true },
  ]);
  const ratio = thinEvenly(sorted.filter((f) => num(f.axis_ratio) !== null || num(f.model_axis_ratio) !== null), MAX_PLOT_POINTS).map((f) => ({
    t: xOf(f),
    observed: num(f.axis_ratio),
    model: num(f.model_axis_ratio),
    inFlight: f.in_flight === true,
  }));

  let height: { t: number; heightM: number; inFlight: boolean }[] | null = null;
  let parabola: { t: number; heightM: number }[] | null = null;
  const pxPerM = num(toss.px_per_m);
  const u = num(toss.launch_speed_m_s);
  if (window !== null && pxPerM !== null && pxPerM > 0 && u !== null && detected.length > 0) {
    const rollRad = ((num(toss.camera_roll_deg) ?? 0) * Math.PI) / 180;
    const upX = Math.sin(rollRad);
    const upY = -Math.cos(rollRad); // image y is down: at zero roll, up is −y
    const model = (t: number): number => {
      const tau = t - window.start;
      return u * tau - 0.5 * gravityMS2 * tau * tau;
    };
    const ref = detected.find((f) => f.in_flight === true) ?? detected[0];
    const raw = detected.map((f) => ({
      t: xOf(f),
      heightM: ((num(f.cx_px)! - num(ref.cx_px)!) * upX + (num(f.cy_px)! - num(ref.cy_px)!) * upY) / pxPerM,
      inFlight: f.in_flight === true,
    }));
    const flying = raw.filter((r) => r.inFlight);
    const offset = flying.length > 0 ? flying.reduce((s, r) => s + model(r.t) - r.heightM, 0) / flying.length : 0;
    height = raw.map((r) => ({ ...r, heightM: r.heightM + offset }));
    parabola = Array.from({ length: 64 }, (_, i) => {
      const t = window.start + ((window.end - window.start) * i) / 63;
      return { t, heightM: model(t) };
    });
  }
  return { timeInSeconds, window, track, ratio, height, parabola };
}

/** The three plots as Vega-Lite specs, in order track, axis ratio, flight (the flight plot only when its data exist). */
export function tossPlotsSpec(data: TossPlotData, size = { width: 270, height: 170 }): VegaLiteSpec[] {
  const xTitle = data.timeInSeconds ? columnLabel('t_s') : columnLabel('frame');
  const x = { type: 'quantitative', title: xTitle, scale: { nice: false, zero: false } };
  const windowLayer = data.window === null ? [] : [{
    data: { values: [data.window] },
    mark: { type: 'rect', color: WINDOW_FILL },
    encoding: { x: { ...x, field: 'start' }, x2: { field: 'end' } },
  }];
  const opacity = { condition: { test: 'datum.inFlight', value: 1 }, value: 0.3 };
  const charts: VegaLiteSpec[] = [
    {
      title: 'track (shaded: in flight)',
      width: size.width,
      height: size.height,
      layer: [
        ...windowLayer,
        {
          data: { values: data.track },
          mark: { type: 'point', filled: true, size: 12 },
          encoding: {
            x: { ...x, field: 't' },
            y: { field: 'px', type: 'quantitative', title: 'position (px)', scale: { zero: false } },
            color: { field: 'coord', type: 'nominal', title: null, scale: { domain: ['cx_px', 'cy_px'], range: [...TRACK_COLOURS] }, legend: { labelExpr: "datum.label == 'cx_px' ? '" + columnLabel('cx_px') + "' : '" + columnLabel('cy_px') + "'" } },
            opacity,
          },
        },
      ],
    },
    {
      title: 'axis ratio: observed and fitted',
      width: size.width,
      height: size.height,
      layer: [
        ...windowLayer,
        {
          data: { values: data.ratio.filter((r) => r.observed !== null) },
          mark: { type: 'point', filled: true, size: 12, color: '#5b6883' },
          encoding: { x: { ...x, field: 't' }, y: { field: 'observed', type: 'quantitative', title: columnLabel('axis_ratio'), scale: { domain: [0, 1] } }, opacity },
        },
        {
          data: { values: data.ratio.filter((r) => r.model !== null) },
          mark: { type: 'line', color: '#D55E00', strokeWidth: 1.6 },
          encoding: { x: { ...x, field: 't' }, y: { field: 'model', type: 'quantitative', scale: { domain: [0, 1] } } },
        },
      ],
    },
  ];
  if (data.height !== null && data.parabola !== null) {
    charts.push({
      title: 'flight: height and parabola',
      width: size.width,
      height: size.height,
      layer: [
        ...windowLayer,
        {
          data: { values: data.height },
          mark: { type: 'point', filled: true, size: 12, color: '#5b6883' },
          encoding: { x: { ...x, field: 't' }, y: { field: 'heightM', type: 'quantitative', title: 'height (m)' }, opacity },
        },
        {
          data: { values: data.parabola },
          mark: { type: 'line', color: '#009E73', strokeWidth: 1.6 },
          encoding: { x: { ...x, field: 't' }, y: { field: 'heightM', type: 'quantitative' } },
        },
      ],
    });
  }
  return charts;
}

/** The per-toss plots as inline SVGs (one per plot; ids start with `idPrefix`). */
export async function tossPlots(data: TossPlotData, idPrefix: string): Promise<string[]> {
  return Promise.all(tossPlotsSpec(data).map((spec, i) => renderPlot(spec, `${idPrefix}-${i}`)));
}
