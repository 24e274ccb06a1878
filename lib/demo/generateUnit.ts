/**
 * The whole fictional demo unit: people, rooms, formulary, patients and cases over the last
 * months, plus today's list (scheduled, in progress, done) relative to a reference "now".
 */
import { generateDemoCase } from './generateCase';
import { generateDemoPatient, type DemoPatient } from './patient';
import { createRng, type Rng } from './random';
import type { DemoCase } from './types';
import {
  DEMO_FORMULARY,
  DEMO_PROCEDURALISTS,
  DEMO_PROCEDURES,
  DEMO_ROOMS,
  DEMO_STAFF,
  DEMO_UNIT,
  SEDATION_NURSES,
  procedureType,
  type DemoProceduralist,
  type DemoRoom,
  type DemoStaffMember,
  type DemoUnitInfo,
  type FormularyDrug,
  type ProcedureId,
  type ProcedureType,
} from './unit';
import { addDays, isoWeekday, localDateOf, parseDate, subtractMonths, wallTimeAt, zonedWallTimeToUtc } from './zonedTime';

export interface GenerateDemoUnitOptions {
  seed: number | string;
  /** Reference "now", ISO 8601 UTC: past cases end before its local date, today's list is on it. */
  now: string;
  /** Months of history before today (default 6). */
  months?: number;
  /** Number of past (signed) cases (default 400). */
  cases?: number;
  /** Number of cases on today's list, dealt round the rooms (default 12; fewer if the day is full). */
  todayCases?: number;
}

export interface DemoUnit {
  unit: DemoUnitInfo;
  rooms: readonly DemoRoom[];
  staff: readonly DemoStaffMember[];
  proceduralists: readonly DemoProceduralist[];
  formulary: readonly FormularyDrug[];
  procedures: readonly ProcedureType[];
  patients: DemoPatient[];
  /** Past cases then today's, in order of start; keys 'demo-0001', 'demo-0002', … in that order. */
  cases: DemoCase[];
}

/** Share of past cases that are a patient's second or later visit. */
export const REPEAT_VISIT_SHARE = 0.2;
const TURNOVER_MIN: readonly [number, number] = [10, 20];

interface Slot {
  date: string;
  roomId: string;
  procedureId: ProcedureId;
  /** Minutes after midnight, local. */
  startMin: number;
}

function hhmm(s: string): number {
  const [h, m] = s.split(':').map(Number);
  return h * 60 + m;
}

/** Book one case into the first room of the day that has room for it (earliest free first). */
function book(rng: Rng, cursors: Map<string, number>, date: string, procedureId: ProcedureId): Slot | null {
  const slot = procedureType(procedureId).slotMin;
  const dayStart = hhmm(DEMO_UNIT.workingHours.start);
  const dayEnd = hhmm(DEMO_UNIT.workingHours.end);
  const rooms = DEMO_ROOMS.filter((r) => r.procedures.includes(procedureId));
  let best: { room: DemoRoom; at: number } | null = null;
  for (const room of rooms) {
    const k = `${date}|${room.id}`;
    if (!cursors.has(k)) cursors.set(k, dayStart + 5 * rng.int(0, 3));
    const at = cursors.get(k) as number;
    if (at + slot <= dayEnd && (!best || at < best.at)) best = { room, at };
  }
  if (!best) return null;
  cursors.set(`${date}|${best.room.id}`, best.at + slot + 5 * Math.round(rng.int(TURNOVER_MIN[0], TURNOVER_MIN[1]) / 5));
  return { date, roomId: best.room.id, procedureId, startMin: best.at };
}

/** Start minutes for cases in order within [from, to): the free time split at random, in 5-min steps. */
function spreadOver(rng: Rng, procs: readonly ProcedureId[], from: number, to: number): number[] {
  const busy = procs.reduce((a, p) => a + procedureType(p).slotMin, 0);
  const free = Math.max(0, to - from - busy);
  const cuts = Array.from({ length: procs.length + 1 }, () => rng.next());
  const sum = cuts.reduce((a, b) => a + b, 0);
  const out: number[] = [];
  let at = from;
  procs.forEach((p, i) => {
    at += 5 * Math.floor((free * cuts[i]) / sum / 5);
    out.push(at);
    at += procedureType(p).slotMin;
  });
  return out;
}

function startIso(slot: Slot): string {
  const { year, month, day } = parseDate(slot.date);
  const ms = zonedWallTimeToUtc({ year, month, day, hour: Math.floor(slot.startMin / 60), minute: slot.startMin % 60 }, DEMO_UNIT.timeZone);
  return new Date(ms).toISOString();
}

/**
 * Generate the demo unit. Deterministic: the same options give the same output, byte for byte.
 * Cases fall on working days (Mon–Fri, no public holidays) between 08:00 and 17:00 local time
 * in the unit's zone; every case is generated from its own stream `case:<key>`.
 * @example generateDemoUnit({ seed: 1, now: '2026-03-04T11:30:00Z', cases: 20 }).cases[0].key //=> 'demo-0001'
 */
export function generateDemoUnit(options: GenerateDemoUnitOptions): DemoUnit {
  const months = options.months ?? 6;
  const pastCount = options.cases ?? 400;
  const todayCount = options.todayCases ?? 12;
  const nowMs = Date.parse(options.now);
  if (Number.isNaN(nowMs)) throw new Error(`generateDemoUnit: now is not an ISO instant: ${options.now}`);
  const root = createRng(options.seed);
  const zone = DEMO_UNIT.timeZone;
  const today = localDateOf(nowMs, zone);

  const days: string[] = [];
  for (let d = subtractMonths(today, months); d < today; d = addDays(d, 1)) {
    if (DEMO_UNIT.workingDays.includes(isoWeekday(d))) days.push(d);
  }
  if (pastCount > 0 && days.length === 0) throw new Error('generateDemoUnit: no working day in the history window (months too small)');

  // 1. Book past cases into days and rooms.
  const sched = root.fork('schedule');
  const mix = DEMO_PROCEDURES.map((p) => [p.id, p.share] as const);
  const cursors = new Map<string, number>();
  const past: Slot[] = [];
  for (let i = 0; i < pastCount; i++) {
    const procedureId = sched.weighted(mix);
    let slot: Slot | null = null;
    for (let tries = 0; !slot && tries < 200; tries++) slot = book(sched, cursors, sched.pick(days), procedureId);
    if (!slot) throw new Error('generateDemoUnit: too many cases for the working days available');
    past.push(slot);
  }
  const byStart = (a: Slot, b: Slot) => a.date.localeCompare(b.date) || a.startMin - b.startMin || a.roomId.localeCompare(b.roomId);
  past.sort(byStart);

  // 2. Today's list: the cases dealt round the rooms, each room's spread over the whole day
  //    (the free time split at random between them), so at most times of day some are done
  //    and some still to come. When "now" falls in working hours, one room's case is put
  //    under way: it started 5–20 min before now.
  const todaySched = root.fork(`today:${today}`);
  const todaySlots: Slot[] = [];
  const dayStart = hhmm(DEMO_UNIT.workingHours.start);
  const dayEnd = hhmm(DEMO_UNIT.workingHours.end);
  const nowWall = wallTimeAt(nowMs, zone);
  const nowMin = nowWall.hour * 60 + nowWall.minute;
  const anchorRoom = todaySched.int(0, DEMO_ROOMS.length - 1);
  DEMO_ROOMS.forEach((room, r) => {
    const n = Math.floor(todayCount / DEMO_ROOMS.length) + (r < todayCount % DEMO_ROOMS.length ? 1 : 0);
    const procs: ProcedureId[] = [];
    let busy = 0;
    for (let i = 0; i < n; i++) {
      const procedureId = todaySched.weighted(mix.filter(([id]) => room.procedures.includes(id)));
      const slotMin = procedureType(procedureId).slotMin;
      if (busy + slotMin + 10 * (i + 1) > dayEnd - dayStart) break;
      procs.push(procedureId);
      busy += slotMin;
    }
    const push = (procedureId: ProcedureId, startMin: number) => todaySlots.push({ date: today, roomId: room.id, procedureId, startMin });
    const anchorAt = 5 * Math.floor((nowMin - todaySched.int(5, 20)) / 5);
    // Which of the room's cases is under way now: about as many before it as the hour suggests.
    const slots = procs.map((p) => procedureType(p).slotMin);
    let j = Math.min(procs.length - 1, Math.round(((anchorAt - dayStart) / (dayEnd - dayStart)) * procs.length));
    while (j > 0 && slots.slice(0, j).reduce((a, b) => a + b, 0) > anchorAt - dayStart) j--;
    while (j < procs.length - 1 && anchorAt + slots.slice(j).reduce((a, b) => a + b, 0) > dayEnd) j++;
    if (r === anchorRoom && procs.length > 0 && anchorAt >= dayStart && anchorAt + slots[j] <= dayEnd) {
      const anchored = procs[j];
      const after = procs.slice(j + 1);
      spreadOver(todaySched, procs.slice(0, j), dayStart, anchorAt).forEach((at, i) => push(procs[i], at));
      push(anchored, anchorAt);
      const afterStart = anchorAt + procedureType(anchored).slotMin;
      const fits = afterStart + after.reduce((a, p) => a + procedureType(p).slotMin, 0) <= dayEnd;
      if (fits) spreadOver(todaySched, after, afterStart, dayEnd).forEach((at, i) => push(after[i], at));
    } else {
      spreadOver(todaySched, procs, dayStart, dayEnd).forEach((at, i) => push(procs[i], at));
    }
  });
  todaySlots.sort(byStart);

  // 3. Patients: most come once; about one past case in five is a repeat visit.
  const uniquePast = Math.max(pastCount > 0 ? 1 : 0, Math.round(pastCount * (1 - REPEAT_VISIT_SHARE)));
  const patientCount = uniquePast + todaySlots.length;
  const patients: DemoPatient[] = [];
  for (let i = 0; i < patientCount; i++) {
    patients.push(generateDemoPatient(root.fork(`patient:${i + 1}`), { index: i + 1, mrnPrefix: DEMO_UNIT.mrnPrefix, referenceDate: today }));
  }
  const assign = root.fork('patients');
  const repeaters = Math.max(1, Math.round(uniquePast * 0.4));
  const pastPatient: number[] = [];
  for (let i = 0; i < pastCount; i++) pastPatient.push(i < uniquePast ? i : assign.int(0, repeaters - 1));
  const order = assign.shuffle(pastPatient);
  // A patient does not come twice on one day: swap such a visit with another one.
  for (let pass = 0; pass < 5; pass++) {
    let clashes = 0;
    const seen = new Set<string>();
    for (let i = 0; i < order.length; i++) {
      const k = `${order[i]}|${past[i].date}`;
      if (!seen.has(k)) {
        seen.add(k);
        continue;
      }
      clashes++;
      const j = assign.int(0, order.length - 1);
      [order[i], order[j]] = [order[j], order[i]];
    }
    if (clashes === 0) break;
  }

  // 4. Who works where: one sedation nurse per room and day (a lead now and then), one proceduralist per room, day and specialty.
  const staffing = root.fork('staffing');
  const nurseOf = new Map<string, string>();
  const leads = DEMO_STAFF.filter((s) => s.role === 'lead').map((s) => s.username);
  const nurseFor = (slot: Slot) => {
    const k = `${slot.date}|${slot.roomId}`;
    let u = nurseOf.get(k);
    if (!u) {
      const taken = new Set(DEMO_ROOMS.map((r) => nurseOf.get(`${slot.date}|${r.id}`)).filter(Boolean));
      const freeNurses = SEDATION_NURSES.filter((n) => !taken.has(n));
      const freeLeads = leads.filter((n) => !taken.has(n));
      u = staffing.pick(freeLeads.length > 0 && (staffing.bernoulli(0.08) || freeNurses.length === 0) ? freeLeads : freeNurses);
      nurseOf.set(k, u);
    }
    return u;
  };
  const proceduralistOf = new Map<string, string>();
  const proceduralistFor = (slot: Slot) => {
    const capable = DEMO_PROCEDURALISTS.filter((p) => p.procedures.includes(slot.procedureId));
    const k = `${slot.date}|${slot.roomId}|${capable[0].specialty}`;
    const current = proceduralistOf.get(k);
    if (current && capable.some((p) => p.id === current)) return current;
    const chosen = staffing.pick(capable).id;
    proceduralistOf.set(k, chosen);
    return chosen;
  };

  // 5. Generate every case from its own stream. After the list's working hours every case of
  //    today would be done; so the demo always has open cases to document, today's statuses are
  //    judged against "now" capped at 90 min before the end of the list (a late case stays open).
  const statusCapMs = zonedWallTimeToUtc({ ...parseDate(today), hour: Math.floor((dayEnd - 90) / 60), minute: (dayEnd - 90) % 60 }, zone);
  const statusNow = new Date(Math.min(nowMs, statusCapMs)).toISOString();
  const cases: DemoCase[] = [];
  const all = [...past.map((s, i) => ({ slot: s, patient: patients[order[i]] })), ...todaySlots.map((s, i) => ({ slot: s, patient: patients[uniquePast + i] }))];
  all.forEach(({ slot, patient }, i) => {
    const key = `demo-${String(i + 1).padStart(4, '0')}`;
    cases.push(
      generateDemoCase(root.fork(`case:${key}`), {
        key,
        start: startIso(slot),
        patient,
        procedureId: slot.procedureId,
        roomId: slot.roomId,
        proceduralistId: proceduralistFor(slot),
        nurseUsername: nurseFor(slot),
        now: slot.date === today ? statusNow : options.now,
      }),
    );
  });

  return {
    unit: DEMO_UNIT,
    rooms: DEMO_ROOMS,
    staff: DEMO_STAFF,
    proceduralists: DEMO_PROCEDURALISTS,
    formulary: DEMO_FORMULARY,
    procedures: DEMO_PROCEDURES,
    patients,
    cases,
  };
}
