/**
 * Where the ffmpeg and ffprobe programs are: the npm-bundled static builds
 * (@ffmpeg-installer/ffmpeg, @ffprobe-installer/ffprobe), or system builds named
 * by the environment variables TOSSMETER_FFMPEG / TOSSMETER_FFPROBE.
 */
import { accessSync, chmodSync, constants, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { runChild } from './run.ts';

const require = createRequire(import.meta.url);

/** Makes sure `file` is an executable regular file; adds the x bits if we may. */
function ensureExecutable(file: string, what: string, fix: string): string {
  let mode: number;
  try {
    const st = statSync(file);
    if (!st.isFile()) throw new Error('not a regular file');
    mode = st.mode;
  } catch (err) {
    throw new Error(`${what} "${file}" is not a file (${(err as Error).message}); ${fix}`, { cause: err });
  }
  try {
    accessSync(file, constants.X_OK);
    return file;
  } catch {
    // The package's postinstall `chmod u+x` may not have run (install scripts not approved).
  }
  try {
    chmodSync(file, mode | ((mode & 0o444) >> 2));
    accessSync(file, constants.X_OK);
    return file;
  } catch (err) {
    throw new Error(`${what} "${file}" is not executable and could not be made so; ${fix}`, { cause: err });
  }
}

/** Resolves an override from the environment: a bare name is looked up on PATH by spawn, a path is checked. */
function fromEnv(variable: string, what: string): string | undefined {
  const value = process.env[variable]?.trim();
  if (!value) return undefined;
  if (!value.includes('/') && !value.includes('\\')) return value;
  return ensureExecutable(value, `${what} named by ${variable}`, `set ${variable} to an executable ffmpeg build, or unset it`);
}

const cache = new Map<string, string>();

function resolveBundled(pkg: string, platformPkg: string, what: string): string {
  const key = `${pkg}`;
  const hit = cache.get(key);
  if (hit !== undefined) return hit;
  let bundled: { path: string };
  try {
    bundled = require(pkg) as { path: string };
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    throw new Error(`the bundled ${what} (${pkg}) could not be loaded: ${reason}`, { cause: err });
  }
  const file = ensureExecutable(bundled.path, `the bundled ${what}`, `run \`npm rebuild ${platformPkg}\``);
  cache.set(key, file);
  return file;
}

function platformPackage(scope: string): string {
  return `${scope}/${process.platform}-${process.arch}`;
}

/**
 * The ffmpeg program to run: `TOSSMETER_FFMPEG` when set (a path, or a bare name
 * looked up on PATH), else the static build bundled by @ffmpeg-installer/ffmpeg
 * (a 2018 build: no `-fps_mode`, use `-vsync`). Throws an Error with the fix when
 * the binary is missing or cannot be made executable.
 */
export function ffmpegPath(): string {
  return fromEnv('TOSSMETER_FFMPEG', 'ffmpeg') ?? resolveBundled('@ffmpeg-installer/ffmpeg', platformPackage('@ffmpeg-installer'), 'ffmpeg');
}

/**
 * The ffprobe program to run: `TOSSMETER_FFPROBE` when set, else the static build
 * bundled by @ffprobe-installer/ffprobe. Its binary ships without the execute bit
 * until the package's postinstall runs; this adds the bit itself when the file is
 * writable, and otherwise throws an Error telling to run
 * `npm rebuild @ffprobe-installer/<platform>`.
 */
export function ffprobePath(): string {
  return fromEnv('TOSSMETER_FFPROBE', 'ffprobe') ?? resolveBundled('@ffprobe-installer/ffprobe', platformPackage('@ffprobe-installer'), 'ffprobe');
}

const versions = new Map<string, Promise<string>>();

function versionOf(program: string): Promise<string> {
  let p = versions.get(program);
  if (p === undefined) {
    p = runChild(program, ['-hide_banner', '-version'], { timeoutMs: 15_000 }).then((r) => {
      const first = r.stdout.toString('utf8').split('\n')[0]?.trim() ?? '';
      const m = /\bversion\s+(\S+)/.exec(first);
      if (r.code !== 0 || m === null) {
        versions.delete(program);
        throw new Error(`could not read the version of "${program}" (${r.spawnError?.message ?? (r.stderrTail || `exit code ${r.code}`)})`);
      }
      return m[1];
    });
    versions.set(program, p);
  }
  return p;
}

/**
 * The version string of the ffmpeg that {@link ffmpegPath} names, as its
 * `-version` prints it (e.g. `N-47683-g0e8eb07980-static` for the bundled
 * build), for a run's provenance. Cached per program path.
 */
export function ffmpegVersion(): Promise<string> {
  return versionOf(ffmpegPath());
}

/** The version string of the ffprobe that {@link ffprobePath} names (see {@link ffmpegVersion}). */
export function ffprobeVersion(): Promise<string> {
  return versionOf(ffprobePath());
}
