import 'server-only';
import { ZodError, type z } from 'zod';
import { AppError, toErrorResponse, zodFieldErrors } from '../../errors';
import { actorWith, type Actor } from './session';
import type { Permission } from '../../auth/permissions';
import type { FormState } from '../../form-state';

// What every form action returns (field errors to show beside inputs, or a message): lib/form-state.ts
export type { FormState };

/** What the person typed, minus secrets, so a form that failed validation can show it again. */
export function echoValues(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === 'string' && !/password|confirm|token|^\$/i.test(k)) out[k] = v;
  return out;
}

/**
 * Wraps a server action: session → role from the database → zod → body. The body returns a
 * message (or nothing); errors come back as form state and never as stack traces.
 */
export function formAction<S extends z.ZodType>(
  permission: Permission,
  schema: S,
  body: (actor: Actor, input: z.infer<S>, form: FormData) => Promise<string | void | FormState>,
) {
  // Called as (state, form) by useActionState, or as (form) by a plain <form action> and by a
  // post without JavaScript.
  return async (prevOrForm: FormState | FormData, maybeForm?: FormData): Promise<FormState> => {
    const form = maybeForm ?? (isFormData(prevOrForm) ? prevOrForm : new FormData());
    try {
      const actor = await actorWith(permission);
      const input = schema.parse(Object.fromEntries(form.entries()));
      const out = await body(actor, input, form);
      return typeof out === 'object' ? { ok: true, ...out } : { ok: true, message: out ?? undefined };
    } catch (err) {
      if (isNextControlFlow(err)) throw err;
      if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err), values: echoValues(form) };
      if (err instanceof AppError) return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values: echoValues(form) };
      const { body: safe } = toErrorResponse(err);
      return { ok: false, message: safe.error.message };
    }
  };
}

/** The decoded argument may come from another realm's FormData class, so instanceof won't do. */
export function isFormData(v: unknown): v is FormData {
  return typeof v === 'object' && v !== null && typeof (v as FormData).get === 'function' && typeof (v as FormData).entries === 'function';
}

// redirect() and notFound() signal by throwing; they must pass through untouched.
function isNextControlFlow(err: unknown): boolean {
  const digest = (err as { digest?: unknown } | null)?.digest;
  return typeof digest === 'string' && (digest.startsWith('NEXT_REDIRECT') || digest.startsWith('NEXT_HTTP_ERROR_FALLBACK') || digest === 'NEXT_NOT_FOUND');
}
