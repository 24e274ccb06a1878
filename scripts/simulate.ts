/**
 * `npm run simulate -- --room <roomId> [--scenario apnea|hypoxemia|calm] [--port 2575] [--host 127.0.0.1]
 *   [--count N] [--location CODE] [--facility NAME] [--seed S] [--interval-ms 1000] [--kpa] [--no-register]`
 *
 * A bedside monitor: one ORU^R01 (IHE PCD-01 shape) per second over MLLP with EtCO2, RR, SpO2 and
 * HR from the demo generator's live scenario stream (lib/demo/liveScenario.ts), timed now. The
 * room's location (PV1-3) comes from the database (PLATEAU_DATABASE_URL, else PLATEAU_DB_FILE)
 * unless --location is given.
 * The listener accepts only known devices, so unless --no-register the simulator makes sure an
 * active Device row "sim-<room>" with sending facility SIM-<room> exists, bound to the room.
 * Prints each ACK code; exits non-zero if any message was refused.
 */
import net from 'node:net';
import { randomUUID } from 'node:crypto';
import { createRng, liveScenarioStream, LIVE_SCENARIOS, type LiveScenario } from '../lib/demo';
import { buildOru, readAck } from '../lib/ingest/hl7';
import { MllpDecoder, mllpFrame } from '../lib/ingest/mllp';
import { closeDb, openDb, sqlOf } from '../lib/db/client';
import { databaseTarget } from '../lib/db/target';

function args(argv: string[]): Map<string, string> {
  const m = new Map<string, string>();
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (!a.startsWith('--')) continue;
    const next = argv[i + 1];
    if (next === undefined || next.startsWith('--')) m.set(a.slice(2), 'true');
    else {
      m.set(a.slice(2), next);
      i++;
    }
  }
  return m;
}

async function main() {
  const a = args(process.argv.slice(2));
  const room = a.get('room');
  if (!room) throw new Error('--room <roomId> is required');
  const scenario = (a.get('scenario') ?? 'calm') as LiveScenario;
  if (!LIVE_SCENARIOS.includes(scenario)) throw new Error(`--scenario must be one of ${LIVE_SCENARIOS.join(', ')}`);
  const port = Number(a.get('port') ?? process.env.PLATEAU_MLLP_PORT ?? 2575);
  const host = a.get('host') ?? '127.0.0.1';
  const count = a.has('count') ? Number(a.get('count')) : Infinity;
  const intervalMs = Number(a.get('interval-ms') ?? 1000);
  const facility = a.get('facility') ?? `SIM-${room}`;
  let location = a.get('location');
  if (!location || !a.has('no-register')) {
    const client = openDb(databaseTarget());
    try {
      const q = sqlOf(client);
      const r = await q.get<{ id: string; unitId: string; location: string | null }>('SELECT "id", "unitId", "location" FROM "Room" WHERE "id" = ? OR "name" = ?', [room, room]);
      if (!r) throw new Error(`room ${room} not found in the database`);
      location ??= r.location ?? undefined;
      if (!location) throw new Error(`room ${room} has no location code; pass --location`);
      if (!a.has('no-register')) {
        const registered = await q.tx(async (t) => {
          if (await t.get('SELECT "id" FROM "Device" WHERE "sendingFacility" = ? AND "active" = TRUE', [facility])) return false;
          await t.run('INSERT INTO "Device" ("id", "unitId", "roomId", "label", "sendingFacility", "equipmentId", "active", "createdAt") VALUES (?, ?, ?, ?, ?, ?, TRUE, ?)', [`sim-${r.id}`, r.unitId, r.id, `Simulator (${r.id})`, facility, `SIM-${r.id}`, new Date()]);
          return true;
        });
        if (registered) console.log(`registered device sim-${r.id} (sending facility ${facility}) for ${r.id}`);
      }
    } finally {
      await closeDb(client);
    }
  }
  const stream = liveScenarioStream(createRng(a.get('seed') ?? `${room}-${scenario}`), scenario, 0);
  const sock = net.connect({ port, host });
  await new Promise<void>((res, rej) => {
    sock.once('connect', () => res());
    sock.once('error', rej);
  });
  sock.setNoDelay(true);
  const decoder = new MllpDecoder();
  const waiting: ((ack: string) => void)[] = [];
  sock.on('data', (c) => {
    for (const e of decoder.push(c)) if (e.kind === 'message') waiting.shift()?.(e.text);
  });
  sock.on('close', () => {
    for (const w of waiting.splice(0)) w('');
  });
  console.log(`simulating ${scenario} in ${room} (location ${location}) → ${host}:${port}`);
  let refused = 0;
  let stop = false;
  process.on('SIGINT', () => (stop = true));
  for (let i = 0; i < count && !stop; i++) {
    const started = Date.now();
    const s = stream.next().value!;
    const msg = buildOru({ controlId: `${facility}-${randomUUID().slice(0, 8)}-${i}`, at: new Date(Math.floor(started / 1000) * 1000), sendingFacility: facility, location, equipmentId: `SIM-${room}`, kPa: a.has('kpa'), values: { etco2: s.etco2, rr: s.rr, spo2: s.spo2, hr: s.hr } });
    const ack = await new Promise<string>((res) => {
      waiting.push(res);
      sock.write(mllpFrame(msg));
    });
    const r = readAck(ack);
    if (r.code !== 'AA') refused++;
    console.log(`${new Date().toISOString()} EtCO2 ${s.etco2} RR ${s.rr} SpO2 ${s.spo2} HR ${s.hr} → ${r.code || 'no ACK'} ${r.text}${r.err ? ` ${r.err}` : ''}`);
    if (!ack) break;
    const wait = intervalMs - (Date.now() - started);
    if (i + 1 < count && wait > 0) await new Promise((res) => setTimeout(res, wait));
  }
  sock.end();
  process.exit(refused > 0 ? 1 : 0);
}

void main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
