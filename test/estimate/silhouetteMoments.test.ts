import { describe, expect, it } from 'vitest';
import {
  silhouetteVariancePartialsInto,
  silhouetteVariances,
  type SilhouetteVariancePartials,
} from '../../src/estimate/silhouetteMoments.ts';

const fresh = (): SilhouetteVariancePartials => ({ lambdaMajor: 0, lambdaMinor: 0, dMajorDr: 0, dMinorDr: 0, dMajorDTau: 0, dMinorDTau: 0 });

describe('silhouetteVariances', () => {
  it('silhouetteVariances(r, 0) is a uniform ellipse of semi-axes 1 and r: variances 1/4 and r²/4', () => {
    // Second moments of a uniform elliptical disc: a²/4 and b²/4 (standard integral, common practice, no source).
    for (const r of [0.05, 0.3, 0.7, 1]) {
      const v = silhouetteVariances(r, 0);
      expect(v.lambdaMajor).toBeCloseTo(0.25, 14);
      expect(v.lambdaMinor).toBeCloseTo((r * r) / 4, 14);
    }
  });

  it('silhouetteVariances(0, tau) is the rim seen edge-on: a 2 × tau rectangle, variances 1/3 and tau²/12', () => {
    // Uniform rectangle of half-widths 1 and tau/2 (the full thickness is h = tau·a): variances 1/3 and (tau/2)²/3
    // (standard integral, common practice, no source).
    const v = silhouetteVariances(0, 0.1);
    expect(v.lambdaMajor).toBeCloseTo(1 / 3, 14);
    expect(v.lambdaMinor).toBeCloseTo(0.01 / 12, 14);
  });

  it('silhouetteVariancePartialsInto gives the same variances and derivatives that match central differences to 1e-7', () => {
    for (const tau of [0.02, 0.144, 0.4]) {
      for (const r of [0.01, 0.2, 0.5, 0.8, 0.97]) {
        const v = silhouetteVariancePartialsInto(r, tau, fresh());
        const ref = silhouetteVariances(r, tau);
        expect(v.lambdaMajor).toBe(ref.lambdaMajor);
        expect(v.lambdaMinor).toBe(ref.lambdaMinor);
        // Central differences, step 1e-6: truncation error O(h²) ≈ 1e-12 relative, well inside the tolerance.
        const h = 1e-6;
        const rp = silhouetteVariances(r + h, tau);
        const rm = silhouetteVariances(r - h, tau);
        const tp = silhouetteVariances(r, tau + h);
        const tm = silhouetteVariances(r, tau - h);
        const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThan(1e-7 * Math.max(1, Math.abs(b)));
        close(v.dMajorDr, (rp.lambdaMajor - rm.lambdaMajor) / (2 * h));
        close(v.dMinorDr, (rp.lambdaMinor - rm.lambdaMinor) / (2 * h));
        close(v.dMajorDTau, (tp.lambdaMajor - tm.lambdaMajor) / (2 * h));
        close(v.dMinorDTau, (tp.lambdaMinor - tm.lambdaMinor) / (2 * h));
      }
    }
  });
});
