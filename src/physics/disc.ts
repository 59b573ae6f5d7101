/** Principal moments of inertia of a coin modelled as a solid cylinder, kg·m². */
export interface DiscInertia {
  /** About a diameter (through the centre, in the coin's plane), kg·m². */
  readonly i1: number;
  /** About the symmetry axis (the normal through the centre), kg·m². */
  readonly i3: number;
}

/**
 * Moments of inertia of a uniform solid cylinder of radius `radiusM` (m), thickness `thicknessM` (m)
 * and mass `massKg` (kg, default 1, so the result is per kilogram: the rotation depends only on ratios).
 * `i3 = m a²/2`, `i1 = m (a²/4 + h²/12)`; the thin-disc limit gives `i3 = 2 i1`.
 * Negative or non-finite dimensions give NaN moments.
 *
 * References: the standard table of moments of inertia for a solid cylinder (any mechanics handbook; common practice).
 */
export function discInertia(radiusM: number, thicknessM: number, massKg = 1): DiscInertia {
  if (!(radiusM >= 0) || !(thicknessM >= 0) || !(massKg >= 0) || !Number.isFinite(radiusM + thicknessM + massKg)) {
    return { i1: NaN, i3: NaN };
  }
  const a2 = radiusM * radiusM;
  return {
    i1: massKg * (a2 / 4 + (thicknessM * thicknessM) / 12),
    i3: (massKg * a2) / 2,
  };
}
