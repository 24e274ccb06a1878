// Creates an administrator account from the command line.
// Usage: npm run user:create -- <username> "<Display name>" [--role admin|lead|nurse|safety]
// The password is read from the terminal (hidden) or, when piped, from the first line of stdin.
import { randomUUID } from 'node:crypto';
import readline from 'node:readline';
import { NewUserInput } from '../lib/domain/user';
import { zodMessage } from '../lib/_shared/zodMessage';
import { hashPassword, passwordProblem } from '../lib/server/password';
import { createUser, DuplicateUsernameError } from '../lib/db/users';
import { openDb, closeDb } from '../lib/db/client';
import { databaseTarget, describeTarget } from '../lib/db/target';
import { applyMigrations } from '../lib/db/schemaEngine';

async function readPassword(): Promise<string> {
  if (!process.stdin.isTTY) {
    const rl = readline.createInterface({ input: process.stdin });
    for await (const line of rl) return line;
    return '';
  }
  process.stdout.write('Password (10+ characters, letters and digits): ');
  return new Promise((resolve) => {
    const stdin = process.stdin;
    let value = '';
    stdin.setRawMode(true);
    stdin.resume();
    stdin.on('data', (b) => {
      const s = b.toString('utf8');
      if (s === '\r' || s === '\n') {
        stdin.setRawMode(false);
        stdin.pause();
        process.stdout.write('\n');
        resolve(value);
      } else if (s === '\u0003') process.exit(130);
      else if (s === '\u007f') value = value.slice(0, -1);
      else value += s;
    });
  });
}

async function main() {
  const args = process.argv.slice(2);
  const roleIdx = args.indexOf('--role');
  const role = roleIdx >= 0 ? args.splice(roleIdx, 2)[1] : 'admin';
  const [username, displayName] = args;
  if (!username || !displayName) {
    console.error('usage: npm run user:create -- <username> "<Display name>" [--role admin]');
    process.exit(2);
  }
  const password = await readPassword();
  const parsed = NewUserInput.safeParse({ username, displayName, role, password });
  if (!parsed.success) {
    console.error(zodMessage(parsed.error));
    process.exit(2);
  }
  const problem = passwordProblem(password, username);
  if (problem) {
    console.error(`password: ${problem}`);
    process.exit(2);
  }
  const target = databaseTarget();
  const file = describeTarget(target);
  await applyMigrations(target);
  const client = openDb(target);
  const unit = await client.unit.findFirst({ orderBy: { createdAt: 'asc' } });
  try {
    await createUser(client, { id: randomUUID(), username: parsed.data.username, displayName: parsed.data.displayName, role: parsed.data.role, passwordHash: await hashPassword(password), unitId: unit?.id ?? null }, { id: null, role: null, origin: 'command line' }, new Date());
  } catch (e) {
    if (e instanceof DuplicateUsernameError) {
      console.error(e.message);
      process.exit(2);
    }
    throw e;
  }
  console.log(`created ${parsed.data.role} account ${parsed.data.username} in ${file}`);
  await closeDb(client);
}
main().catch((e) => {
  console.error(e);
  process.exit(1);
});
