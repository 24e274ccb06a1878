/**
 * `npm run bench`: every benchmark in turn. Each bench module exports `async function main()`
 * that prints its figures; add new ones to BENCHES.
 */
import { main as rules } from './rules';

const BENCHES: [name: string, run: () => Promise<void>][] = [['rules', rules]];

async function runAll(): Promise<void> {
  for (const [name, run] of BENCHES) {
    console.log(`\n== bench: ${name}`);
    await run();
  }
}

void runAll();
import { main as hl7 } from './hl7';
BENCHES.push(['hl7', hl7]);
import { main as capnogram } from './capnogram';
BENCHES.push(['capnogram', capnogram]);

import { main as load } from './load';
BENCHES.push(['load', async () => void (await load())]);
