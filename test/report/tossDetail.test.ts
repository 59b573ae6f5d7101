import { describe, expect, it } from 'vitest';
import type { TossRow } from '../../src/dataset/index.ts';
import { tossDetail } from '../../src/report/tossDetail.ts';

describe('tossDetail', () => {
  it('explains each flag and shows the error of a failed toss as text', () => {
    const toss = { toss_id: 'a<1>', tosser: 'T01', file: 'a.mp4', status: 'failed', flags: 'not_measured', error: 'no <coin> found' } as unknown as TossRow;
    const card = tossDetail(toss, 'toss-0', { plotsSvg: null, strip: { note: 'No frames.' } }).value;
    expect(card).toContain('<section class="toss failed" id="toss-0">');
    expect(card).toContain('<code>not_measured</code> The clip failed (status failed); see error.');
    expect(card).toContain('<p class="error">no &lt;coin&gt; found</p>');
    expect(card).toContain('a&lt;1&gt;');
  });
  it('shows values with their field labels, the plots and the strip images', () => {
    const toss = { toss_id: 'b', tosser: null, file: 'b.mp4', status: 'ok', flags: null, spin_rev_s: 31.25, start_face: 'heads', predicted_face: 'tails', observed_face: null } as unknown as TossRow;
    const card = tossDetail(toss, 'toss-1', {
      plotsSvg: ['<svg id="x"></svg>'],
      strip: [{ frame: 12, tS: 0.05, inFlight: true, dataUri: 'data:image/png;base64,AA==', displayPx: 150 }],
    }).value;
    expect(card).toContain('<dt>spin_rev_s (rev/s)</dt><dd>31.25</dd>');
    expect(card).toContain('<svg id="x"></svg>');
    expect(card).toContain('<img src="data:image/png;base64,AA==" width="150" height="150"');
    expect(card).toContain('frame 12 · 0.0500 s');
    expect(card).toContain('heads → predicted tails');
  });
});
