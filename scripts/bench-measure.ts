/**
 * One `measure` run of the benchmark in its own process (so its peak RSS is its own):
 *   node --import tsx scripts/bench-measure.ts <clips dir> <out dir> <jobs|default> <set>...
 * Prints one JSON line: frames, seconds, maxRssKb.
 */
import { measureStudy } from '../src/pipeline/study.ts';

const [clips, out, jobsArg, ...sets] = process.argv.slice(2);
const jobs = jobsArg === 'default' ? undefined : Number(jobsArg);
const t0 = performance.now();
let frames = 0;
for (const set of sets) {
  const r = await measureStudy({ input: `${clips}/${set}`, out: `${out}/${set}`, cache: false, jobs });
  frames += r.frames.length;
}
const seconds = (performance.now() - t0) / 1000;
process.stdout.write(JSON.stringify({ frames, seconds, maxRssKb: process.resourceUsage().maxRSS }) + '\n');
