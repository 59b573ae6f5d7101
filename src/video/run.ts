/**
 * The one place where the ffmpeg layer starts a child process: an argument array
 * (never a shell), a time limit past which the child is killed with SIGKILL, an
 * AbortSignal that kills it too, and the tail of its stderr kept for messages.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import type { Readable, Writable } from 'node:stream';

/** How a child ended. */
export interface ChildExit {
  /** Exit code, or null when it was killed by a signal. */
  code: number | null;
  /** The signal that ended it, or null. */
  signal: NodeJS.Signals | null;
  /** True when our time limit killed it. */
  timedOut: boolean;
  /** True when the caller's AbortSignal killed it. */
  aborted: boolean;
  /** The error when the program could not be started at all (e.g. ENOENT). */
  spawnError?: Error;
  /** The last lines of its stderr (at most `stderrTailBytes` bytes), trimmed. */
  stderrTail: string;
}

/** Options of {@link startChild}. */
export interface StartChildOptions {
  /**
   * Time limit in ms; past it the child gets SIGKILL and `exit.timedOut` is true.
   * Only time while the clock runs counts (see {@link ChildHandle.pauseClock}).
   * Default: no limit (Infinity).
   */
  timeoutMs?: number;
  /** Kills the child when it fires. */
  signal?: AbortSignal;
  /** Whether to pipe stdin (default 'ignore'). */
  stdin?: 'pipe' | 'ignore';
  /** Whether to pipe stdout (default 'pipe'). */
  stdout?: 'pipe' | 'ignore';
  /** How many bytes of stderr to keep (default 8192). */
  stderrTailBytes?: number;
}

/** A running child and the means to watch and stop it. */
export interface ChildHandle {
  /** The Node child process. */
  readonly child: ChildProcess;
  /** The child's stdin when piped, else null. */
  readonly stdin: Writable | null;
  /** The child's stdout when piped, else null. */
  readonly stdout: Readable | null;
  /** Resolves (never rejects) once the child has exited and its stdio closed. */
  readonly exited: Promise<ChildExit>;
  /** True once the child has exited. */
  readonly hasExited: () => boolean;
  /** The stderr tail so far. */
  readonly stderrTail: () => string;
  /** Sends SIGKILL if the child is still running (idempotent). */
  readonly kill: () => void;
  /** Stops counting time against the limit (while a consumer holds our output). */
  readonly pauseClock: () => void;
  /** Resumes counting time against the limit. */
  readonly resumeClock: () => void;
  /** Adds `ms` to the time limit (for work that grows as input is fed in). */
  readonly extendClock: (ms: number) => void;
}

/** Keeps the last `limit` bytes written to it. */
class TailBuffer {
  private chunks: Buffer[] = [];
  private bytes = 0;
  constructor(private readonly limit: number) {}
  push(chunk: Buffer): void {
    this.chunks.push(chunk);
    this.bytes += chunk.length;
    while (this.bytes - this.chunks[0].length >= this.limit) {
      this.bytes -= this.chunks[0].length;
      this.chunks.shift();
    }
  }
  text(): string {
    const all = Buffer.concat(this.chunks);
    return all.subarray(Math.max(0, all.length - this.limit)).toString('utf8').trim();
  }
}

/**
 * Starts `command` with `args` (an array, no shell), stdio as asked, stderr
 * collected into a bounded tail. The clock starts running at once.
 */
export function startChild(command: string, args: readonly string[], opts: StartChildOptions = {}): ChildHandle {
  const timeoutMs = opts.timeoutMs ?? Infinity;
  const tail = new TailBuffer(opts.stderrTailBytes ?? 8192);
  const child = spawn(command, [...args], {
    shell: false,
    windowsHide: true,
    stdio: [opts.stdin ?? 'ignore', opts.stdout ?? 'pipe', 'pipe'],
    env: { ...process.env, AV_LOG_FORCE_NOCOLOR: '1' },
  });
  let exited = false;
  let timedOut = false;
  let aborted = false;
  let timer: NodeJS.Timeout | undefined;
  let remainingMs = timeoutMs;
  let clockStartedAt = -1;

  const kill = (): void => {
    if (!exited && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  };
  const onTimeout = (): void => {
    timer = undefined;
    timedOut = true;
    kill();
  };
  const resumeClock = (): void => {
    if (clockStartedAt >= 0 || exited || !Number.isFinite(remainingMs)) return;
    clockStartedAt = performance.now();
    timer = setTimeout(onTimeout, Math.max(0, remainingMs));
  };
  const pauseClock = (): void => {
    if (clockStartedAt < 0) return;
    remainingMs -= performance.now() - clockStartedAt;
    clockStartedAt = -1;
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
  };
  const extendClock = (ms: number): void => {
    if (!(ms > 0) || !Number.isFinite(remainingMs)) return;
    const running = clockStartedAt >= 0;
    pauseClock();
    remainingMs += ms;
    if (running) resumeClock();
  };
  const onAbort = (): void => {
    aborted = true;
    kill();
  };
  if (opts.signal?.aborted) onAbort();
  else opts.signal?.addEventListener('abort', onAbort, { once: true });

  child.stderr?.on('data', (chunk: Buffer) => tail.push(chunk));
  // A write to a dead child's stdin raises EPIPE; the exit status tells the story.
  child.stdin?.on('error', () => {});
  child.stdout?.on('error', () => {});

  const exitedPromise = new Promise<ChildExit>((resolve) => {
    let spawnError: Error | undefined;
    const finish = (code: number | null, signal: NodeJS.Signals | null): void => {
      if (exited) return;
      exited = true;
      pauseClock();
      opts.signal?.removeEventListener('abort', onAbort);
      resolve({ code, signal, timedOut, aborted, spawnError, stderrTail: tail.text() });
    };
    child.once('error', (err) => {
      spawnError = err;
      // 'close' does not always follow a failed spawn.
      if (child.pid === undefined) finish(null, null);
    });
    child.once('close', (code, signal) => finish(code, signal));
  });

  resumeClock();
  return {
    child,
    stdin: child.stdin,
    stdout: child.stdout,
    exited: exitedPromise,
    hasExited: () => exited,
    stderrTail: () => tail.text(),
    kill,
    pauseClock,
    resumeClock,
    extendClock,
  };
}

/** Options of {@link runChild}. */
export interface RunChildOptions extends Omit<StartChildOptions, 'stdin' | 'stdout'> {
  /** Largest stdout kept, in bytes (default 64 MiB); past it the child is killed. */
  maxStdoutBytes?: number;
}

/** The result of {@link runChild}. */
export interface RunResult extends ChildExit {
  /** Everything the child wrote to stdout. */
  stdout: Buffer;
  /** True when stdout passed `maxStdoutBytes` and the child was killed. */
  stdoutOverflow: boolean;
}

/**
 * Runs `command` with `args` to completion and collects its stdout; never
 * rejects: the caller reads `code`, `timedOut`, `aborted`, `spawnError`.
 */
export async function runChild(command: string, args: readonly string[], opts: RunChildOptions = {}): Promise<RunResult> {
  const handle = startChild(command, args, { ...opts, stdin: 'ignore', stdout: 'pipe' });
  const maxBytes = opts.maxStdoutBytes ?? 64 * 1024 * 1024;
  const chunks: Buffer[] = [];
  let bytes = 0;
  let stdoutOverflow = false;
  handle.stdout?.on('data', (chunk: Buffer) => {
    bytes += chunk.length;
    if (bytes > maxBytes) {
      stdoutOverflow = true;
      handle.kill();
      return;
    }
    chunks.push(chunk);
  });
  const exit = await handle.exited;
  return { ...exit, stdout: Buffer.concat(chunks), stdoutOverflow };
}

/**
 * A default time limit in ms for a child that reads a file of `sizeBytes`
 * (and, when known, decodes `pixels` pixels in all): 30 s plus 2 s per MB,
 * or 30 s plus 1 s per 5 million pixels, whichever is longer. Generous on
 * purpose: it catches a hung child, not a slow one.
 */
export function defaultTimeoutMs(sizeBytes: number, pixels = 0): number {
  const bySize = 30_000 + (2_000 * Math.max(0, sizeBytes)) / 1e6;
  const byPixels = 30_000 + (1_000 * Math.max(0, pixels)) / 5e6;
  return Math.ceil(Math.max(bySize, byPixels));
}

/** The error an aborted operation rejects with: the signal's reason, or a DOMException 'AbortError'. */
export function abortError(signal: AbortSignal | undefined): unknown {
  return signal?.reason ?? new DOMException('The operation was aborted', 'AbortError');
}

/**
 * The last `n` non-empty lines of a stderr tail, joined with ' / ' for a one-line
 * message; ffmpeg's `[demuxer @ 0x...] ` prefixes are dropped.
 */
export function lastLines(stderrTail: string, n = 3): string {
  return stderrTail
    .split(/\r?\n|\r/)
    .map((line) => line.replace(/^\[[^\]]* @ 0x[0-9a-f]+\]\s*/i, '').trim())
    .filter((line) => line.length > 0)
    .slice(-n)
    .join(' / ');
}
