'use server';
import { redirect } from 'next/navigation';
import { SignInInput } from '@/lib/domain/user';
import { zodMessage } from '@/lib/_shared/zodMessage';
import { checkCredentials } from '@/lib/server/auth';
import { requestOrigin, startSession } from '@/lib/server/session';
import { HOME_FOR_ROLE } from '@/lib/server/roles';

export interface SignInState {
  error: string | null;
  username: string;
}

export async function signInAction(_prev: SignInState, form: FormData): Promise<SignInState> {
  const raw = { username: String(form.get('username') ?? ''), password: String(form.get('password') ?? '') };
  const parsed = SignInInput.safeParse(raw);
  if (!parsed.success) return { error: zodMessage(parsed.error), username: raw.username };
  const origin = await requestOrigin();
  const result = await checkCredentials(parsed.data.username, parsed.data.password, origin);
  if (!result.ok) return { error: result.error, username: raw.username };
  await startSession(result.userId, origin);
  redirect(HOME_FOR_ROLE[result.role]);
}
