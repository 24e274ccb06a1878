/**
 * `npm run bench`: every benchmark in turn; each prints its figures (none is a test).
 * `npm run bench -- rules stats` runs only the ones named. Recorded figures are in docs/.
 */
import { main as rules } from './rules';
import { main as stats } from './stats';
import { main as capnogram } from './capnogram';
import { main as scale } from './scale';
import { main as hl7 } from './hl7';
import { main as load } from './load';

const BENCHES: [name: string, run: () => Promise<unknown>][] = [
  ['rules', rules],
  ['stats', stats],
  ['capnogram', capnogram],
  ['scale', scale],
  ['hl7', hl7],
  ['load', load],
];

async function runAll(): Promise<void> {
  const only = process.argv.slice(2);
  for (const [name, run] of BENCHES) {
    if (only.length && !only.includes(name)) continue;
    console.log(`\n== bench: ${name}`);
    await run();
  }
}

runAll().catch((e) => {
  console.error(e);
  process.exit(1);
});
