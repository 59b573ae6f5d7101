import { describe, expect, it } from 'vitest';
import { fitEllipseTrimmed } from '../../src/vision/fitEllipseTrimmed.ts';
import { fitEllipseDirect } from '../../src/vision/fitEllipseDirect.ts';
import { gauss, prng } from './synthSequence.ts';

describe('fitEllipseTrimmed', () => {
  it('recovers a coin from the outline of its union with a "hand" rectangle (the merged blob of a catch), points within a+3 px of a predicted centre as the tracker selects them', () => {
    const rand = prng(3);
    const e = { cx: 800, cy: 400, a: 50, b: 30, t: 0.7 };
    const inHand = (x: number, y: number): boolean => x >= 790 && x <= 900 && y >= 420 && y <= 520;
    const inCoin = (x: number, y: number): boolean => {
      const dx = x - e.cx, dy = y - e.cy;
      const u = (dx * Math.cos(e.t) + dy * Math.sin(e.t)) / e.a, v = (-dx * Math.sin(e.t) + dy * Math.cos(e.t)) / e.b;
      return u * u + v * v <= 1;
    };
    const xs: number[] = [], ys: number[] = [];
    const add = (x: number, y: number): void => {
      if (Math.hypot(x - 801, y - 399) > e.a + 3) return; // the tracker's selection around its prediction
      xs.push(x + 0.2 * gauss(rand)); ys.push(y + 0.2 * gauss(rand));
    };
    for (let i = 0; i < 200; i++) { // coin outline outside the hand
      const s = (2 * Math.PI * i) / 200;
      const u = e.a * Math.cos(s), v = e.b * Math.sin(s);
      const x = e.cx + u * Math.cos(e.t) - v * Math.sin(e.t), y = e.cy + u * Math.sin(e.t) + v * Math.cos(e.t);
      if (!inHand(x, y)) add(x, y);
    }
    const nCoin = xs.length;
    for (let x = 790; x <= 900; x += 1) { if (!inCoin(x, 420)) add(x, 420); }
    for (let y = 420; y <= 520; y += 1) { if (!inCoin(790, y)) add(790, y); }
    const plain = fitEllipseDirect(xs, ys);
    const r = fitEllipseTrimmed(xs, ys, xs.length);
    expect(r.ok && plain.ok).toBe(true);
    if (!r.ok || !plain.ok) return;
    const err = Math.hypot(r.ellipse.cx - e.cx, r.ellipse.cy - e.cy);
    expect(err).toBeLessThan(0.3);
    expect(Math.hypot(plain.ellipse.cx - e.cx, plain.ellipse.cy - e.cy)).toBeGreaterThan(3); // the untrimmed fit is pulled away
    expect(Math.abs(r.ellipse.major - 100)).toBeLessThan(0.6);
    expect(Math.abs(r.ellipse.minor - 60)).toBeLessThan(0.6);
    expect(r.used).toBeLessThan(xs.length);
    expect(r.used).toBeGreaterThanOrEqual(0.9 * nCoin);
  });
});
