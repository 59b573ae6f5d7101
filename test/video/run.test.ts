import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ffmpegPath } from '../../src/video/paths.ts';
import { defaultTimeoutMs, lastLines, runChild, startChild } from '../../src/video/run.ts';
import { childPids } from './fixtures.ts';

// An endless source: ffmpeg generates test frames forever and throws them away.
const ENDLESS = ['-hide_banner', '-nostdin', '-v', 'error', '-f', 'lavfi', '-i', 'testsrc=size=64x48:rate=1000', '-f', 'null', '-'];

describe('runChild / startChild', () => {
  it('collects stdout and exit code 0 of a finished child', async () => {
    const r = await runChild(ffmpegPath(), ['-hide_banner', '-version']);
    expect(r.code).toBe(0);
    expect(r.stdout.toString('utf8')).toMatch(/^ffmpeg version /);
    expect(r.timedOut).toBe(false);
  });

  it('passes arguments verbatim, never through a shell', async () => {
    // In a shell, `;` would end the command and `$(...)` would run; here they are part of a file name.
    const weird = 'file:/nonexistent dir/$(touch pwned); echo hi.mp4';
    const r = await runChild(ffmpegPath(), ['-hide_banner', '-v', 'error', '-i', weird, '-f', 'null', '-']);
    expect(r.code).not.toBe(0);
    expect(r.stderrTail).toContain('$(touch pwned); echo hi.mp4');
    expect(r.stdout.length).toBe(0);
    expect(existsSync('pwned')).toBe(false);
  });

  it('kills a child with SIGKILL past its time limit', async () => {
    const t0 = performance.now();
    const r = await runChild(ffmpegPath(), ENDLESS, { timeoutMs: 300 });
    expect(r.timedOut).toBe(true);
    expect(r.signal).toBe('SIGKILL');
    expect(performance.now() - t0).toBeLessThan(5_000);
    expect(await childPids('ffmpeg')).toEqual([]);
  });

  it('kills a child when the AbortSignal fires', async () => {
    const ac = new AbortController();
    setTimeout(() => ac.abort(), 200);
    const r = await runChild(ffmpegPath(), ENDLESS, { signal: ac.signal });
    expect(r.aborted).toBe(true);
    expect(r.timedOut).toBe(false);
    expect(r.signal).toBe('SIGKILL');
  });

  it('does not count paused time against the limit', async () => {
    const h = startChild(ffmpegPath(), ENDLESS, { timeoutMs: 150, stdout: 'ignore' });
    h.pauseClock();
    await new Promise((r) => setTimeout(r, 400));
    expect(h.hasExited()).toBe(false);
    h.resumeClock();
    const exit = await h.exited;
    expect(exit.timedOut).toBe(true);
  });

  it('keeps only a bounded tail of stderr', async () => {
    // -loglevel debug on an endless source writes stderr fast; keep 1000 bytes of it.
    const r = await runChild(ffmpegPath(), ['-hide_banner', '-nostdin', '-v', 'debug', '-f', 'lavfi', '-i', 'testsrc=size=16x16', '-frames:v', '200', '-f', 'null', '-'], { stderrTailBytes: 1000 });
    expect(r.code).toBe(0);
    expect(r.stderrTail.length).toBeGreaterThan(100);
    expect(Buffer.byteLength(r.stderrTail)).toBeLessThanOrEqual(1000);
  });

  it('extendClock adds time to a running limit', async () => {
    const h = startChild(ffmpegPath(), ENDLESS, { timeoutMs: 100, stdout: 'ignore' });
    h.extendClock(400);
    await new Promise((r) => setTimeout(r, 250));
    expect(h.hasExited()).toBe(false);
    expect((await h.exited).timedOut).toBe(true);
  });

  it('reports a program that cannot be started as spawnError, without throwing', async () => {
    const r = await runChild('/nonexistent/ffmpeg', ['-version']);
    expect(r.spawnError?.message).toContain('ENOENT');
  });
});

describe('defaultTimeoutMs', () => {
  it('is 30 s plus 2 s per MB, or 30 s plus 1 s per 5 Mpx decoded, whichever is longer', () => {
    expect(defaultTimeoutMs(0)).toBe(30_000);
    expect(defaultTimeoutMs(100e6)).toBe(230_000);
    expect(defaultTimeoutMs(1e6, 3000 * 1920 * 1080)).toBe(Math.ceil(30_000 + (3000 * 1920 * 1080) / 5e3));
  });
});

describe('lastLines', () => {
  it('keeps the last non-empty lines without ffmpeg\'s [demuxer @ 0x...] prefixes', () => {
    const tail = 'a\n\n[mov,mp4,m4a,3gp,3g2,mj2 @ 0x15632800] stream 0, offset 0x1884: partial file\r\nfile:x: Invalid data\n';
    expect(lastLines(tail, 2)).toBe('stream 0, offset 0x1884: partial file / file:x: Invalid data');
  });
});
