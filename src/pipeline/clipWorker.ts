/**
 * The worker side of the clip pool: measures one clip per task. Runs inside a worker thread started by
 * `study.ts` through `clipWorkerBootstrap.mjs` (which registers the TypeScript loader first).
 */
import { measureClip, type ClipJob, type ClipResult } from './clip.ts';

/** The task a worker receives. */
export interface ClipTask {
  job: ClipJob;
  threads?: number;
}

/** Measures one clip (piscina calls the default export). */
export default async function run(task: ClipTask): Promise<ClipResult> {
  return measureClip(task.job, { threads: task.threads });
}
