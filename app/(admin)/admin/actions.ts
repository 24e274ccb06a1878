'use server';
import { randomUUID } from 'node:crypto';
import { revalidatePath } from 'next/cache';
import { NewUserInput } from '@/lib/domain/user';
import { zodMessage } from '@/lib/_shared/zodMessage';
import { requireAccess } from '@/lib/server/access';
import { hashPassword, passwordProblem } from '@/lib/server/password';
import { createUser, DuplicateUsernameError } from '@/lib/db/users';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';
import { unitForUser } from '@/lib/server/unit';

export interface CreateUserState {
  error: string | null;
  created: string | null;
}

export async function createUserAction(_prev: CreateUserState, form: FormData): Promise<CreateUserState> {
  const admin = await requireAccess('/admin');
  const parsed = NewUserInput.safeParse({
    username: String(form.get('username') ?? ''),
    displayName: String(form.get('displayName') ?? ''),
    role: String(form.get('role') ?? ''),
    password: String(form.get('password') ?? ''),
  });
  if (!parsed.success) return { error: zodMessage(parsed.error), created: null };
  const problem = passwordProblem(parsed.data.password, parsed.data.username);
  if (problem) return { error: `password: ${problem}`, created: null };
  const unit = await unitForUser(admin);
  try {
    await createUser(
      db(),
      { id: randomUUID(), username: parsed.data.username, displayName: parsed.data.displayName, role: parsed.data.role, passwordHash: await hashPassword(parsed.data.password), unitId: unit?.id ?? null },
      { id: admin.id, role: admin.role, origin: await requestOrigin() },
      now(),
    );
  } catch (e) {
    if (e instanceof DuplicateUsernameError) return { error: e.message, created: null };
    throw e;
  }
  revalidatePath('/admin');
  return { error: null, created: parsed.data.username };
}
