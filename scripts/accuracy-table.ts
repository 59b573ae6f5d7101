/**
 * Prints the error table of a measured dataset against the truth files of rendered clips:
 *   node --import tsx scripts/accuracy-table.ts <dataset dir> <clips dir>
 */
import { compareWithTruth, errorTable } from '../test/helpers/compareTruth.ts';

const [dataset, clips] = process.argv.slice(2);
if (!dataset || !clips) {
  process.stderr.write('usage: accuracy-table.ts <dataset dir> <clips dir>\n');
  process.exit(2);
}
process.stdout.write(errorTable(await compareWithTruth(dataset, clips)) + '\n');
