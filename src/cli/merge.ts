/**
 * `tossmeter merge <dir>... --out <dir>`: joins the dataset folders of a sharded study (`measure --shard k/n`)
 * into one dataset, byte-identical (CSV and Parquet) to a single run. Parses options, calls `mergeDatasets`,
 * prints the closing table. No computation here.
 */
import type { Command } from '@commander-js/extra-typings';
import { mergeDatasets } from '../pipeline/merge.ts';
import { closingTable } from './measure.ts';

/** Adds the `merge` command to `program`. */
export function registerMerge(program: Command): void {
  program
    .command('merge')
    .description('Join the dataset folders of a sharded study (measure --shard k/n) into one dataset, identical to a single run.')
    .argument('<dirs...>', 'the shard folders, each the --out of one `tossmeter measure --shard k/n`; all of 1..n exactly once')
    .requiredOption('--out <dir>', 'output folder for the merged dataset (not one of the shard folders)')
    .option('--quiet', 'print nothing but errors')
    .action(async (dirs, o) => {
      const result = await mergeDatasets(dirs, o.out);
      if (o.quiet) return;
      const shards = result.shards.map((s) => `${s.index}/${s.count} (${s.tosses} tosses)`).join(', ');
      process.stderr.write(`merged ${result.shards.length} shards: ${shards}\n`);
      process.stdout.write(closingTable(result));
    });
}
