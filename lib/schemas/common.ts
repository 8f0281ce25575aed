import { z } from 'zod';

// In the browser zod must not try `new Function` to compile its object parsers: the pages' script
// policy (lib/security/headers.ts) refuses eval, and the refused try is reported as a violation.
// Every schema module imports this one first, so this runs before any object schema is built.
if (typeof window !== 'undefined') z.config({ jitless: true });

export const uuidSchema = z.string().uuid({ message: 'Not a valid id' });

// C0 controls and DEL; a multi-line text keeps tab, line feed and carriage return
const CONTROL_LINE = /[\u0000-\u001f\u007f]/;
const CONTROL_MULTILINE = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;

/** False for a string holding half of a UTF-16 surrogate pair, which no keyboard types and PostgreSQL's JSON refuses. */
export function isWellFormedText(s: string): boolean {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c >= 0xd800 && c <= 0xdbff) {
      const next = s.charCodeAt(i + 1);
      if (!(next >= 0xdc00 && next <= 0xdfff)) return false;
      i++;
    } else if (c >= 0xdc00 && c <= 0xdfff) return false;
  }
  return true;
}

/**
 * Adds the checks every stored text needs to a string schema: no NUL or other control characters
 * (PostgreSQL refuses NUL in text; the others hide in names and CSV exports), and no lone
 * surrogates. `multiline` texts (notes) may hold tabs and line breaks.
 */
export function safe<T extends z.ZodString>(schema: T, opts: { multiline?: boolean } = {}): T {
  const control = opts.multiline ? CONTROL_MULTILINE : CONTROL_LINE;
  return schema
    .refine((s) => !control.test(s), { message: opts.multiline ? 'Remove the control characters (such as NUL): only letters, digits, punctuation, tabs and line breaks are kept' : 'Remove the control characters (such as NUL, tab or line break): this is one line of text' })
    .refine(isWellFormedText, { message: 'This text holds a broken character (half of a UTF-16 surrogate pair): type it again' }) as T;
}

/** A trimmed text of at most `max` characters, safe to store (see `safe`); `min` 1 with `required` makes it mandatory. */
export function safeText(o: { max: number; min?: number; required?: string; multiline?: boolean }) {
  let s = z.string({ message: o.required ?? 'Enter text' }).trim();
  if (o.min) s = s.min(o.min, { message: o.required ?? `Use at least ${o.min} characters` });
  return safe(s.max(o.max, { message: `Use at most ${o.max} characters` }), { multiline: o.multiline });
}

// a plain decimal number as a person types it: sign, digits, one point, an exponent
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d{1,3})?$/;

/**
 * Text from a form field as a number, strictly: "12", "-0.5", "1e3" and numbers in JSON pass;
 * "0x10", "0b1", "1_000", "Infinity", true and null do not (Number() would turn them into 16, 1,
 * NaN-free surprises, 1 and 0). The result still goes through `inner` for its range.
 */
export function strictNumber<T extends z.ZodType>(message: string, inner?: (n: z.ZodNumber) => T) {
  const n = z.number({ message });
  return z.preprocess((v) => {
    if (typeof v === 'string') {
      const t = v.trim();
      return DECIMAL.test(t) ? Number(t) : v;
    }
    return v;
  }, inner ? inner(n) : n);
}

// Forms send '' for an untouched optional input and JSON may send null: both mean "not given".
const blankToUndefined = (v: unknown) => (v === null || (typeof v === 'string' && v.trim() === '') ? undefined : v);

/** An optional strict number: blank or null is "not given", anything else must be a plain number. */
export function optionalStrictNumber<T extends z.ZodType>(message: string, inner?: (n: z.ZodNumber) => T) {
  const n = z.number({ message });
  return z.preprocess((v) => {
    const b = blankToUndefined(v);
    if (typeof b === 'string') {
      const t = b.trim();
      return DECIMAL.test(t) ? Number(t) : b;
    }
    return b;
  }, (inner ? inner(n) : n).optional());
}

/**
 * A calendar date as YYYY-MM-DD that exists: 2026-02-30 is refused (Date.parse would roll it to
 * 2 March, and PostgreSQL would then refuse the row).
 */
export function isoDateSchema(message = 'Use a date like 2026-11-02') {
  return z
    .string({ message })
    .regex(/^\d{4}-\d{2}-\d{2}$/, { message })
    .refine(
      (s) => {
        const [y, m, d] = s.split('-').map(Number) as [number, number, number];
        const t = new Date(Date.UTC(y, m - 1, d));
        return y >= 1 && t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
      },
      { message: 'That date does not exist' },
    );
}
