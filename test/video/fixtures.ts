/**
 * Test inputs made at test time (no committed binaries): gray and RGB test
 * patterns, a temporary folder, and a look at our ffmpeg children in /proc.
 */
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A fresh temporary folder and a function that removes it. */
export async function tempDir(prefix = 'tossmeter-video-'): Promise<{ dir: string; cleanup: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), prefix));
  return { dir, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

/**
 * A smooth gray frame that changes with `k`: a drifting sinusoid plus a moving
 * bright disc, values within 40..215 (no clipping through the limited-range
 * yuv420p conversion).
 */
export function smoothGrayFrame(width: number, height: number, k: number): Uint8Array {
  const out = new Uint8Array(width * height);
  const cx = (width * (0.2 + 0.6 * ((k * 0.07) % 1))), cy = height / 2, r = Math.min(width, height) / 5;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let v = 110 + 50 * Math.sin((2 * Math.PI * (x + 3 * k)) / width) * Math.cos((2 * Math.PI * y) / height);
      if ((x - cx) ** 2 + (y - cy) ** 2 < r * r) v = 205;
      out[y * width + x] = Math.round(v);
    }
  }
  return out;
}

/** Deterministic pseudo-random bytes (xorshift32 from `seed`): the hardest case for a lossless codec. */
export function noiseFrame(bytes: number, seed: number): Uint8Array {
  const out = new Uint8Array(bytes);
  let s = (seed * 2654435761) >>> 0 || 1;
  for (let i = 0; i < bytes; i++) {
    s ^= s << 13; s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5; s >>>= 0;
    out[i] = s & 0xff;
  }
  return out;
}

/** Pids of live (not zombie) children of this process whose command is `comm` (Linux /proc). */
export async function childPids(comm = 'ffmpeg'): Promise<number[]> {
  const pids: number[] = [];
  for (const name of await readdir('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = await readFile(`/proc/${name}/stat`, 'utf8');
      // pid (comm) state ppid ...
      const m = /^\d+ \((.*)\) (\S) (\d+)/.exec(stat);
      if (m !== null && m[1] === comm && m[2] !== 'Z' && Number(m[3]) === process.pid) pids.push(Number(name));
    } catch {
      // the process ended while we looked
    }
  }
  return pids;
}

/** Bytes a process has written so far (`wchar` of /proc/<pid>/io). */
export async function bytesWritten(pid: number): Promise<number> {
  const io = await readFile(`/proc/${pid}/io`, 'utf8');
  const m = /wchar:\s*(\d+)/.exec(io);
  if (m === null) throw new Error(`no wchar in /proc/${pid}/io`);
  return Number(m[1]);
}

/** Waits `ms` milliseconds. */
export const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));
