/**
 * `heathours request`: its options; the work (pipeline/commands/request.ts: configuration,
 * regions, the request planner) loads only when the command runs.
 */
import type { Command } from 'commander';

export function register(program: Command): void {
  program
    .command('request')
    .description(
      "write the data-store download requests the atlas needs (requests.json) and a Python script for the store's official client (download.py); no network",
    )
    .option('--config <file>', 'atlas configuration', 'content/atlas.yaml')
    .option('--out <dir>', 'download folder (default: the folder of the first dataset.files pattern)')
    .option('--margin <degrees>', "margin around the regions' bounding box [°], before snapping to the product grid", '0.5')
    .option('--max-fields <n>', 'per-request limit of the store [fields = variables × hours] (default: 120000 for ERA5, 12000 for ERA5-Land, from memory)')
    .action(async (opts: { config: string; out?: string; margin: string; maxFields?: string }) => (await import('./request.ts')).requestAction(opts));
}
