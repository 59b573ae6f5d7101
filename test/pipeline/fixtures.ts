/**
 * Shared inputs for the pipeline and fault tests, all made at test time (no committed binaries): small rendered
 * clips, the CLI run in-process with its output captured, the CLI as a child process, and a look at processes in /proc.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse } from 'csv-parse/sync';
import { main } from '../../src/cli/main.ts';
import { renderStudy } from '../../src/synth/index.ts';
import type { SynthOptions } from '../../src/synth/index.ts';

/** The repository root (tests run from it, but spawned children get it explicitly). */
export const REPO = resolve(import.meta.dirname, '../..');

/** A fresh temporary folder and a function that removes it. */
export async function tempDir(prefix = 'tossmeter-pipeline-'): Promise<{ dir: string; cleanup: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), prefix));
  return { dir, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

/**
 * Renders small fast clips of known motion (320x240, 500 frames/s, launch 1.5–2 m/s: about 250 frames each),
 * with their `manifest.csv`. Extra options override these.
 */
export async function renderSmall(outDir: string, extra: Partial<SynthOptions> = {}): Promise<string[]> {
  const { clips } = await renderStudy({
    outDir,
    count: 2,
    seed: 3,
    width: 320,
    height: 240,
    captureFps: 500,
    launchSpeedMS: [1.5, 2],
    ...extra,
  });
  return clips.map((c) => c.file);
}

/**
 * A tiny clip for the fuzz test: 160x120, 200 frames/s, a slow launch seen from 0.3 m, about 80 frames,
 * rendered without supersampling or motion blur so it takes well under a second.
 */
export async function renderTiny(outDir: string): Promise<string> {
  const { clips } = await renderStudy({
    outDir,
    count: 1,
    seed: 5,
    width: 160,
    height: 120,
    captureFps: 200,
    launchSpeedMS: [1.2, 1.2],
    distanceM: 0.3,
    supersampling: 1,
    subExposures: 1,
    crf: 28,
    x264Preset: 'ultrafast',
  });
  return clips[0].file;
}

/** What one in-process run of the CLI gave. */
export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs `tossmeter <args>` in this process through `main(argv)` and captures what it writes to stdout and stderr.
 * `process.exitCode` is reset afterwards so one run cannot leak its code into the next (or into the test runner).
 */
export async function runCli(args: string[]): Promise<CliRun> {
  const out: string[] = [];
  const err: string[] = [];
  const origOut = process.stdout.write.bind(process.stdout);
  const origErr = process.stderr.write.bind(process.stderr);
  process.stdout.write = ((chunk: string | Uint8Array) => (out.push(String(chunk)), true)) as typeof process.stdout.write;
  process.stderr.write = ((chunk: string | Uint8Array) => (err.push(String(chunk)), true)) as typeof process.stderr.write;
  process.exitCode = undefined;
  try {
    const code = await main(['node', 'tossmeter', ...args]);
    return { code, stdout: out.join(''), stderr: err.join('') };
  } finally {
    process.stdout.write = origOut;
    process.stderr.write = origErr;
    process.exitCode = undefined;
  }
}

/** Starts `node bin/tossmeter.mjs <args>` as a child process (its own stdout/stderr collected). */
export function spawnCli(args: string[]): { child: ChildProcess; stdout: () => string; stderr: () => string; exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }> } {
  const child = spawn(process.execPath, [join(REPO, 'bin/tossmeter.mjs'), ...args], { cwd: REPO, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout!.on('data', (c: Buffer) => (stdout += c.toString('utf8')));
  child.stderr!.on('data', (c: Buffer) => (stderr += c.toString('utf8')));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((r) => child.once('close', (code, signal) => r({ code, signal })));
  return { child, stdout: () => stdout, stderr: () => stderr, exited };
}

/** Pids of live (not zombie) processes whose parent is `ppid` and whose command is `comm` (Linux /proc). */
export async function childrenOf(ppid: number, comm: string): Promise<number[]> {
  const pids: number[] = [];
  for (const name of await readdir('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = await readFile(`/proc/${name}/stat`, 'utf8');
      const m = /^\d+ \((.*)\) (\S) (\d+)/.exec(stat);
      if (m !== null && m[1] === comm && m[2] !== 'Z' && Number(m[3]) === ppid) pids.push(Number(name));
    } catch {
      // ended while we looked
    }
  }
  return pids;
}

/** True while a process with this pid exists and is not a zombie. */
export async function isAlive(pid: number): Promise<boolean> {
  try {
    const stat = await readFile(`/proc/${pid}/stat`, 'utf8');
    return !/^\d+ \(.*\) Z /.test(stat);
  } catch {
    return false;
  }
}

/** Waits until `check()` is true, polling every 50 ms; rejects after `limitMs` (a guard against a hang, not a timing assumption). */
export async function waitFor(check: () => boolean | Promise<boolean>, limitMs: number, what: string): Promise<void> {
  const until = Date.now() + limitMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`waited ${limitMs} ms for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** A dataset CSV as records keyed by column name (the formula guard's quote is left as written). */
export async function readCsvRecords(file: string): Promise<Record<string, string>[]> {
  return parse(await readFile(file), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
}

/** The data lines of a CSV text whose first cell is one of `ids` (toss_id is the first column of both tables), header kept. */
export function linesFor(csvText: string, column: string, keep: (value: string) => boolean): string[] {
  const records = parse(csvText, { columns: false, skip_empty_lines: true, relax_column_count: false }) as string[][];
  const header = records[0];
  const at = header.indexOf(column);
  if (at < 0) throw new Error(`no column ${column}`);
  return records.slice(1).filter((r) => keep(r[at])).map((r) => JSON.stringify(r));
}
