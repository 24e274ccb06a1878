import type { PrismaClient } from './generated/client';
import { appendAudit } from './audit';
import { ConflictError } from './cases';
import { getBuiltInRuleSet, listBuiltInRuleSets } from '@/lib/rules';
import { ruleSetSchema, type RuleSet, type RuleSetRef } from '@/lib/domain/ruleSet';
import { RULE_SET_REF_PATTERN } from '@/lib/domain/review';
import { writeTx } from './tx';

export interface RuleSetListing {
  id: string;
  version: number;
  description: string;
  builtIn: boolean;
  rules: string[];
  createdAt: string | null;
  createdBy: string | null;
}

/** Every rule set a lead can choose: the built-ins, then the saved versions (newest version first per id). */
export async function listRuleSets(client: PrismaClient): Promise<RuleSetListing[]> {
  const saved = await client.ruleSetVersion.findMany({ orderBy: [{ ruleSetId: 'asc' }, { version: 'desc' }] });
  const users = await client.user.findMany({ where: { id: { in: saved.map((s) => s.createdById).filter((x): x is string => !!x) } }, select: { id: true, displayName: true } });
  const names = new Map(users.map((u) => [u.id, u.displayName]));
  const builtIn = listBuiltInRuleSets().map((r) => ({ id: r.id, version: r.version, description: r.description, builtIn: true, rules: r.rules.map((x) => x.id), createdAt: null, createdBy: null }));
  const own = saved
    .filter((s) => !getBuiltInRuleSet(s.ruleSetId, s.version))
    .map((s) => {
      const def = JSON.parse(s.definition) as RuleSet;
      return { id: s.ruleSetId, version: s.version, description: def.description, builtIn: s.builtIn, rules: def.rules.map((x) => x.id), createdAt: s.createdAt.toISOString(), createdBy: s.createdById ? (names.get(s.createdById) ?? null) : null };
    });
  return [...builtIn, ...own];
}

/** A rule set by id and version, built-in or saved; null when there is none. */
export async function findRuleSet(client: PrismaClient, ref: RuleSetRef): Promise<RuleSet | null> {
  const built = getBuiltInRuleSet(ref.id, ref.version);
  if (built) return built;
  const saved = await client.ruleSetVersion.findUnique({ where: { ruleSetId_version: { ruleSetId: ref.id, version: ref.version } } });
  return saved ? ruleSetSchema.parse(JSON.parse(saved.definition)) : null;
}

const sameRules = (a: RuleSet, b: RuleSet) => JSON.stringify({ ...a, version: 0 }) === JSON.stringify({ ...b, version: 0 });

/**
 * Saves a lead's rule set as a new, immutable RuleSetVersion: version 1 for a new id, else the
 * latest version + 1 (the version in the document is replaced). A saved version is never
 * edited. The same content as the latest version saves nothing. Built-in ids are refused.
 * Audited in the same transaction.
 */
export async function saveRuleSet(
  client: PrismaClient,
  input: RuleSet,
  actor: { id: string; role: string; origin: string | null },
  now: Date,
): Promise<{ id: string; version: number; created: boolean }> {
  if (getBuiltInRuleSet(input.id)) throw new ConflictError(`ruleSet.id: "${input.id}" is a built-in rule set; save your copy under an id of your own (e.g. "${input.id}-local")`);
  return writeTx(client, async (tx) => {
    const latest = await tx.ruleSetVersion.findFirst({ where: { ruleSetId: input.id }, orderBy: { version: 'desc' } });
    if (latest && sameRules(JSON.parse(latest.definition) as RuleSet, input)) return { id: input.id, version: latest.version, created: false };
    const version = (latest?.version ?? 0) + 1;
    const definition: RuleSet = { ...input, version };
    await tx.ruleSetVersion.create({ data: { id: `${input.id}@${version}`, ruleSetId: input.id, version, definition: JSON.stringify(definition), builtIn: false, createdAt: now, createdById: actor.id } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'rule_set', entityId: `${input.id}@${version}`, after: { id: input.id, version, rules: definition.rules.map((r) => r.id), previous: latest?.version ?? null }, origin: actor.origin });
    return { id: input.id, version, created: true };
  });
}

/** Parses `id@version`. @example parseRuleSetRef('mason-2012@1') //=> { id: 'mason-2012', version: 1 } */
export function parseRuleSetRef(text: string): RuleSetRef | null {
  const m = RULE_SET_REF_PATTERN.exec(text);
  return m ? { id: m[1], version: Number(m[2]) } : null;
}
