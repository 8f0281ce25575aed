import { ZodError } from 'zod';

/** An error whose message is safe to show: it carries the HTTP status to answer with. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code = 'error',
    readonly fieldErrors?: Record<string, string[]>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

/** Too much at once: 429, with the seconds after which a retry is likely to succeed. */
export class TooBusy extends AppError {
  constructor(
    message: string,
    readonly retryAfterS: number,
    code = 'too_busy',
  ) {
    super(429, message, code);
    this.name = 'TooBusy';
  }
}

export const notFound = (what = 'Not found') => new AppError(404, what, 'not_found');
export const forbidden = (what = 'Your role in this lab does not allow this') => new AppError(403, what, 'forbidden');
export const unauthorized = () => new AppError(401, 'Sign in first', 'unauthorized');

export type ErrorBody = { error: { code: string; message: string; fieldErrors?: Record<string, string[]> } };

export function zodFieldErrors(err: ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of err.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Turns any thrown value into a status and a body that leaks nothing internal (and the headers a 429 needs). */
export function toErrorResponse(err: unknown): { status: number; body: ErrorBody; headers?: Record<string, string> } {
  if (err instanceof ZodError) {
    return { status: 422, body: { error: { code: 'invalid', message: 'Some fields are not valid', fieldErrors: zodFieldErrors(err) } } };
  }
  if (err instanceof TooBusy) {
    return { status: 429, body: { error: { code: err.code, message: err.message } }, headers: { 'Retry-After': String(Math.max(1, Math.ceil(err.retryAfterS))) } };
  }
  if (err instanceof AppError) {
    return { status: err.status, body: { error: { code: err.code, message: err.message, fieldErrors: err.fieldErrors } } };
  }
  if (isUniqueViolation(err)) {
    return { status: 409, body: { error: { code: 'conflict', message: 'That name is already taken' } } };
  }
  if (isBadValue(err)) {
    // the schemas refuse these first with field errors; this is the net under them
    return { status: 422, body: { error: { code: 'invalid', message: 'A value could not be stored: check the text for unusual characters and the dates and numbers for impossible values' } } };
  }
  console.error('[veilmeter] unexpected error', err);
  return { status: 500, body: { error: { code: 'internal', message: 'Something went wrong on our side. Try again; if it persists, tell your lab admin.' } } };
}

export function isUniqueViolation(err: unknown): boolean {
  return typeof err === 'object' && err !== null && (err as { code?: unknown }).code === '23505';
}

// PostgreSQL's data exceptions that only bad input causes: NUL or an unencodable character in
// text (22P05, 22021), an impossible date or time (22008, 22007), a number out of its column's
// range (22003), text that is not a value of the column's type (22P02)
const BAD_VALUE_CODES = new Set(['22P05', '22021', '22008', '22007', '22003', '22P02']);

export function isBadValue(err: unknown): boolean {
  const code = typeof err === 'object' && err !== null ? (err as { code?: unknown }).code : undefined;
  return typeof code === 'string' && BAD_VALUE_CODES.has(code);
}
