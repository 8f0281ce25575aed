/**
 * What a server action answers a form with: a message, errors by field, a secret shown once (a new
 * token or signing secret) and the values typed, so a form that failed validation can show them
 * again. Pure, so client components can name it without reaching lib/server.
 */
export type FormState = { ok?: boolean; message?: string; fieldErrors?: Record<string, string[]>; secret?: string; values?: Record<string, string> };
