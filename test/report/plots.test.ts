import { describe, expect, it } from 'vitest';
import { MAX_PLOT_POINTS, renderPlot, thinEvenly } from '../../src/report/plots.ts';

describe('thinEvenly', () => {
  it('returns the same array when it is short enough', () => {
    const a = [1, 2, 3];
    expect(thinEvenly(a, 3)).toBe(a);
  });
  it('keeps exactly max items, the first one, in order, evenly spaced', () => {
    const a = Array.from({ length: 12_345 }, (_, i) => i);
    const t = thinEvenly(a);
    expect(t).toHaveLength(MAX_PLOT_POINTS);
    expect(t[0]).toBe(0);
    for (let i = 1; i < t.length; i++) {
      const gap = t[i] - t[i - 1];
      expect(gap).toBeGreaterThanOrEqual(2); // 12345 / 5000 = 2.469: gaps of 2 or 3
      expect(gap).toBeLessThanOrEqual(3);
    }
    expect(thinEvenly(a)).toEqual(t);
  });
});

describe('renderPlot', () => {
  const spec = (n: number) => ({
    width: 100,
    height: 80,
    data: { values: Array.from({ length: n }, (_, i) => ({ x: i, y: i * i })) },
    mark: { type: 'line', clip: true },
    encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } },
  });
  it('gives inline SVG without namespace URLs, its ids prefixed so two plots never share one', async () => {
    const a = await renderPlot(spec(5), 'plotA');
    const b = await renderPlot(spec(7), 'plotB');
    for (const svg of [a, b]) {
      expect(svg.startsWith('<svg')).toBe(true);
      expect(svg).not.toMatch(/https?:/);
    }
    const ids = (svg: string) => [...svg.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]);
    expect(ids(a).length).toBeGreaterThan(0); // the clip path
    expect(ids(a).every((id) => id.startsWith('plotA-'))).toBe(true);
    expect(ids(b).every((id) => id.startsWith('plotB-'))).toBe(true);
    for (const m of a.matchAll(/url\(#([^)]+)\)/g)) expect(ids(a)).toContain(m[1]);
  });
  it('refuses data given by URL (no network, ever)', async () => {
    const bad = { ...spec(1), data: { url: 'https://example.org/data.json' } };
    await expect(renderPlot(bad, 'bad')).rejects.toThrow(/refused to load/);
  });
  it('rejects an id prefix that is not a plain name', async () => {
    await expect(renderPlot(spec(2), '1"x')).rejects.toThrow(RangeError);
  });
});
