import type { z } from 'zod';

/**
 * One readable line per problem, naming the field: `amount: must be more than 0`.
 * @example zodMessage(err) //=> "amount: must be more than 0"
 */
export function zodMessage(error: z.ZodError): string {
  return error.issues
    .map((i) => {
      const field = i.path.length ? i.path.map((p) => (typeof p === 'number' ? `[${p}]` : String(p))).join('.').replace(/\.\[/g, '[') : 'body';
      return `${field}: ${i.message}`;
    })
    .join('; ');
}
