import type { TrackerOptions } from '../vision/index.ts';

/**
 * The tracker settings `measure` uses (and `observeClip` by default, so both see the same ellipses): the
 * tracker's defaults, plus the second back-fill that follows the coin into the hand before the release, so
 * the flight window can place the release where free flight starts.
 */
export const MEASURE_TRACKER_OPTIONS: TrackerOptions = Object.freeze({ carryBackfill: true });
