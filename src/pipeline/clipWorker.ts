/**
 * The worker side of the clip pool: measures one clip per task. Runs inside a worker thread started by
 * `study.ts` through `clipWorkerBootstrap.mjs` (which registers the TypeScript loader first).
 */
import type { MessagePort } from 'node:worker_threads';
import { measureClip, type ClipJob, type ClipResult } from './clip.ts';

/** The task a worker receives. */
export interface ClipTask {
  job: ClipJob;
  threads?: number;
  /**
   * A message on this port stops the clip: its ffmpeg children are killed and the task rejects. (Terminating
   * the worker thread instead would leave its child processes running.)
   */
  stop?: MessagePort;
}

/** Measures one clip (piscina calls the default export). */
export default async function run(task: ClipTask): Promise<ClipResult> {
  const controller = new AbortController();
  task.stop?.once('message', () => controller.abort(new Error('stopped')));
  try {
    return await measureClip(task.job, { threads: task.threads, signal: controller.signal });
  } finally {
    task.stop?.close();
  }
}
