import { z } from 'zod';

const password = z.string().min(1, { message: 'enter your password to sign' }).max(200);
const freeText = z.string().trim().max(4000, { message: 'must be at most 4,000 characters' }).nullable().optional();

export const SignNoteInput = z.object({ password, freeText });
export const AmendNoteInput = z.object({ password, freeText, reason: z.string().trim().min(5, { message: 'say why the note is amended (at least 5 characters)' }).max(500) });
export const CosignNoteInput = z.object({ password });
