import { describe, expect, it } from 'vitest';
import { bandBoundaryOmega, bandFace, halfTurns } from '../../src/physics/bands.ts';
import { flightTime } from '../../src/physics/ballistic.ts';
import { STANDARD_GRAVITY as G } from '../../src/physics/gravity.ts';
import { faceChanges, upComponent } from '../../src/physics/upFace.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

// Reference: "The probability of heads", American Mathematical Monthly 93(3), 1986, DOI 10.2307/2323340 — the coin
// turns through 2uω/g before a catch at launch height; heads/tails bands between the hyperbolas u·ω = (2k+1)πg/4.

const rng = mulberry32;

describe('two-parameter bands', () => {
  it('worked case on a boundary: u = g/4 (0.5 s flight), ω = 75π rad/s (37.5 rev/s) turns through 37.5 half turns', () => {
    const u = G / 4;
    // 2uω/g = 2 · (g/4) · 75π / g = 37.5π, i.e. π·(k + ½) with k = 37
    expect(Math.abs(halfTurns(u, 75 * Math.PI, G) - 37.5)).toBeLessThan(1e-12);
    // u·ω = (2k+1)πg/4 with k = 37 gives ω = 75πg/(4u) = 75π
    expect(Math.abs(bandBoundaryOmega(37, u, G) - 75 * Math.PI) / (75 * Math.PI)).toBeLessThan(1e-15);
    const w = bandBoundaryOmega(37, u, G);
    expect(bandFace(u, w * (1 - 1e-9), G, true)).toBe('tails'); // 37 changes just below
    expect(bandFace(u, w * (1 + 1e-9), G, true)).toBe('heads'); // 38 just above
    expect(bandFace(u, w, G, true)).toBe('heads'); // on the boundary: counted as changed (edge-on at the catch)
    expect(bandFace(u, w * (1 - 1e-9), G, false)).toBe('heads');
  });
  it('puts the first boundary at a quarter turn (k = 0) and the boundaries on hyperbolas u·ω = const', () => {
    const u = 2.0;
    expect(Math.abs(halfTurns(u, bandBoundaryOmega(0, u, G), G) - 0.5)).toBeLessThan(1e-15);
    expect(bandFace(u, bandBoundaryOmega(0, u, G) * 0.999, G, true)).toBe('heads');
    for (const k of [0, 3, 40]) {
      const c = (2 * k + 1) * Math.PI * G / 4;
      for (const uu of [0.5, 1.7, 3.2]) expect(Math.abs(uu * bandBoundaryOmega(k, uu, G) - c) / c).toBeLessThan(1e-15);
    }
    expect(Number.isNaN(bandBoundaryOmega(-1, u, G))).toBe(true);
    expect(Number.isNaN(bandBoundaryOmega(1.5, u, G))).toBe(true);
  });
  it('alternates faces band by band and is even in ω', () => {
    const u = 2.3;
    for (let k = 0; k < 30; k++) {
      const mid = (bandBoundaryOmega(k, u, G) + bandBoundaryOmega(k + 1, u, G)) / 2;
      expect(bandFace(u, mid, G, true)).toBe(k % 2 === 0 ? 'tails' : 'heads');
      expect(bandFace(u, -mid, G, true)).toBe(bandFace(u, mid, G, true));
    }
  });
  it('agrees with the general precession model for an end-over-end flip (ψ = β = 90°, normal starting up)', () => {
    // a spin about a horizontal diameter is ψ = 90° with L horizontal (β = 90°); the normal starts at phase 0 (up)
    const r = rng(3);
    for (let i = 0; i < 500; i++) {
      const u = 0.5 + 3 * r();
      const w = 2 * Math.PI * 60 * r();
      const t = flightTime(u, G);
      const changes = faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0, t);
      const h = halfTurns(u, w, G);
      if (Math.abs(h - Math.round(h - 0.5) - 0.5) < 1e-9) continue; // a boundary within rounding
      expect(changes).toBe(Math.floor(h + 0.5));
      const up = upComponent(Math.PI / 2, Math.PI / 2, w, 0, t);
      expect(bandFace(u, w, G, true)).toBe(up > 0 ? 'heads' : 'tails');
    }
  });
});
