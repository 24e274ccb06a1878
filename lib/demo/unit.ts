/**
 * Kestrel Bay Day Procedures Unit: the fictional four-room endoscopy unit of Plateau's demo.
 * Every name here is invented; any likeness to a real place or person is chance.
 * Passwords are not here: the database seed creates them.
 */
import type { DoseUnit, DrugClass, Route } from '@/lib/domain/drug';

export interface DemoUnitInfo {
  id: string;
  name: string;
  shortName: string;
  /** IANA zone the unit's wall clock runs on; cases are stored as UTC instants. */
  timeZone: string;
  /** Prefix of the fictional medical record numbers, e.g. 'KBD-000123'. */
  mrnPrefix: string;
  /** ISO weekdays (1 = Monday) and local hours of the elective lists. */
  workingDays: readonly number[];
  workingHours: { start: string; end: string };
}

export const DEMO_UNIT: DemoUnitInfo = {
  id: 'kestrel-bay',
  name: 'Kestrel Bay Day Procedures Unit',
  shortName: 'Kestrel Bay DPU',
  timeZone: 'Europe/Dublin',
  mrnPrefix: 'KBD',
  workingDays: [1, 2, 3, 4, 5],
  workingHours: { start: '08:00', end: '17:00' },
};

export const PROCEDURE_IDS = ['gastroscopy', 'colonoscopy', 'ercp', 'eus', 'bronchoscopy'] as const;
export type ProcedureId = (typeof PROCEDURE_IDS)[number];

export interface ProcedureType {
  id: ProcedureId;
  label: string;
  /** Procedure time (scope in to scope out), minutes: median and the range the generator keeps to. */
  typicalMin: { median: number; min: number; max: number };
  /** Room time booked per case (monitoring start to recovery start), minutes. */
  slotMin: number;
  /** Share of the unit's elective cases (sums to 1). */
  share: number;
}

export const DEMO_PROCEDURES: readonly ProcedureType[] = [
  { id: 'gastroscopy', label: 'Gastroscopy (OGD)', typicalMin: { median: 9, min: 5, max: 15 }, slotMin: 30, share: 0.3 },
  { id: 'colonoscopy', label: 'Colonoscopy', typicalMin: { median: 25, min: 15, max: 40 }, slotMin: 55, share: 0.35 },
  { id: 'ercp', label: 'ERCP', typicalMin: { median: 40, min: 25, max: 60 }, slotMin: 75, share: 0.08 },
  { id: 'eus', label: 'Endoscopic ultrasound (EUS)', typicalMin: { median: 30, min: 20, max: 45 }, slotMin: 60, share: 0.1 },
  { id: 'bronchoscopy', label: 'Flexible bronchoscopy', typicalMin: { median: 25, min: 15, max: 40 }, slotMin: 55, share: 0.17 },
];

export interface DemoRoom {
  id: string;
  name: string;
  /** What the room is equipped for. */
  procedures: readonly ProcedureId[];
  note: string;
}

export const DEMO_ROOMS: readonly DemoRoom[] = [
  { id: 'room-1', name: 'Room 1', procedures: ['gastroscopy', 'colonoscopy'], note: 'Endoscopy' },
  { id: 'room-2', name: 'Room 2', procedures: ['gastroscopy', 'colonoscopy'], note: 'Endoscopy' },
  { id: 'room-3', name: 'Room 3', procedures: ['ercp', 'eus', 'gastroscopy'], note: 'Fluoroscopy and ultrasound' },
  { id: 'room-4', name: 'Room 4', procedures: ['bronchoscopy', 'gastroscopy'], note: 'Bronchoscopy' },
];

export const STAFF_ROLES = ['nurse', 'lead', 'safety_officer', 'admin'] as const;
export type StaffRole = (typeof STAFF_ROLES)[number];

export interface DemoStaffMember {
  /** Demo login name; the seed gives each a password. */
  username: string;
  displayName: string;
  role: StaffRole;
  /** True for the people who sit with the patient and chart the sedation. */
  sedates: boolean;
}

export const DEMO_STAFF: readonly DemoStaffMember[] = [
  { username: 'nurse.ada', displayName: 'Ada Okonkwo', role: 'nurse', sedates: true },
  { username: 'nurse.bram', displayName: 'Bram Lindqvist', role: 'nurse', sedates: true },
  { username: 'nurse.chiara', displayName: 'Chiara Moretti-Hale', role: 'nurse', sedates: true },
  { username: 'nurse.dev', displayName: 'Dev Ramanathan', role: 'nurse', sedates: true },
  { username: 'nurse.eilis', displayName: 'Eilis Brennock', role: 'nurse', sedates: true },
  { username: 'nurse.farah', displayName: 'Farah Haddad', role: 'nurse', sedates: true },
  { username: 'lead.gustavo', displayName: 'Gustavo Ferreira Lund', role: 'lead', sedates: true },
  { username: 'lead.hana', displayName: 'Hana Takemura', role: 'lead', sedates: true },
  { username: 'safety.imani', displayName: 'Imani Castellanos', role: 'safety_officer', sedates: false },
  { username: 'admin.jonas', displayName: 'Jonas Vermeulen', role: 'admin', sedates: false },
];

/** Usernames of the nurses who chart routine lists (leads cover a list now and then). */
export const SEDATION_NURSES: readonly string[] = DEMO_STAFF.filter((s) => s.role === 'nurse').map((s) => s.username);

export interface DemoProceduralist {
  id: string;
  displayName: string;
  specialty: 'gastroenterology' | 'colorectal surgery' | 'respiratory medicine';
  procedures: readonly ProcedureId[];
}

export const DEMO_PROCEDURALISTS: readonly DemoProceduralist[] = [
  { id: 'dr-aldous', displayName: 'Dr Kiran Aldous', specialty: 'gastroenterology', procedures: ['gastroscopy', 'colonoscopy'] },
  { id: 'dr-marchetti', displayName: 'Dr Leonie Marchetti', specialty: 'gastroenterology', procedures: ['gastroscopy', 'colonoscopy', 'ercp', 'eus'] },
  { id: 'dr-osei', displayName: 'Dr Mateo Osei', specialty: 'gastroenterology', procedures: ['gastroscopy', 'ercp', 'eus'] },
  { id: 'dr-ferncliff', displayName: 'Ms Nadia Ferncliff', specialty: 'colorectal surgery', procedures: ['colonoscopy', 'gastroscopy'] },
  { id: 'dr-whitlock', displayName: 'Dr Oren Whitlock', specialty: 'respiratory medicine', procedures: ['bronchoscopy'] },
  { id: 'dr-halvorsen', displayName: 'Dr Priya Halvorsen', specialty: 'respiratory medicine', procedures: ['bronchoscopy'] },
];

export interface FormularyDrug {
  /** Lower-case generic name, the `drug` of a DoseEntry. */
  drug: string;
  label: string;
  drugClass: DrugClass;
  /** Unit doses are charted in. */
  unit: DoseUnit;
  route: Route;
  /** Strength as supplied, e.g. '10 mg/mL'. */
  concentration: string;
  /** A usual single dose in `unit` (for prefilling the dose field). */
  usualDose: number;
  /** A single dose above this is "far above usual": the charting screen asks to confirm. */
  cautionAbove: number;
}

export const DEMO_FORMULARY: readonly FormularyDrug[] = [
  { drug: 'propofol', label: 'Propofol', drugClass: 'sedative', unit: 'mg', route: 'IV', concentration: '10 mg/mL', usualDose: 30, cautionAbove: 100 },
  { drug: 'midazolam', label: 'Midazolam', drugClass: 'sedative', unit: 'mg', route: 'IV', concentration: '1 mg/mL', usualDose: 1, cautionAbove: 5 },
  { drug: 'fentanyl', label: 'Fentanyl', drugClass: 'opioid', unit: 'mcg', route: 'IV', concentration: '50 mcg/mL', usualDose: 25, cautionAbove: 100 },
  { drug: 'ketamine', label: 'Ketamine', drugClass: 'sedative', unit: 'mg', route: 'IV', concentration: '10 mg/mL', usualDose: 20, cautionAbove: 100 },
  { drug: 'naloxone', label: 'Naloxone', drugClass: 'reversal', unit: 'mcg', route: 'IV', concentration: '400 mcg/mL', usualDose: 100, cautionAbove: 400 },
  { drug: 'flumazenil', label: 'Flumazenil', drugClass: 'reversal', unit: 'mg', route: 'IV', concentration: '0.1 mg/mL', usualDose: 0.2, cautionAbove: 1 },
  { drug: 'epinephrine', label: 'Epinephrine (adrenaline)', drugClass: 'other', unit: 'mg', route: 'IV', concentration: '0.1 mg/mL', usualDose: 1, cautionAbove: 2 },
  { drug: 'glycopyrrolate', label: 'Glycopyrrolate', drugClass: 'other', unit: 'mcg', route: 'IV', concentration: '200 mcg/mL', usualDose: 200, cautionAbove: 400 },
];

/** Formulary entry by drug name. Throws on a drug not in the formulary (a generator bug). */
export function formularyDrug(drug: string): FormularyDrug {
  const f = DEMO_FORMULARY.find((d) => d.drug === drug);
  if (!f) throw new Error(`not in the demo formulary: ${drug}`);
  return f;
}

export function procedureType(id: ProcedureId): ProcedureType {
  const p = DEMO_PROCEDURES.find((d) => d.id === id);
  if (!p) throw new Error(`unknown procedure: ${id}`);
  return p;
}
