/**
 * Standard acceleration of free fall, g_n = 9.80665 m/s², exact by definition
 * (declaration of the 3rd General Conference on Weights and Measures, CGPM, 1901).
 * Use it unless a study gives its local g.
 */
export const STANDARD_GRAVITY = 9.80665;
