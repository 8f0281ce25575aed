import clsx from 'clsx';
import type { InputHTMLAttributes } from 'react';

/** A labelled input with its field errors underneath, wired for screen readers. */
export function Field({ label, name, errors, hint, className, ...rest }: InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; errors?: string[]; hint?: string }) {
  const errId = `${name}-error`;
  const bad = !!errors?.length;
  return (
    <label className={clsx('block text-sm', className)}>
      <span className="mb-1 block text-muted">{label}</span>
      <input
        name={name}
        aria-invalid={bad || undefined}
        aria-describedby={bad ? errId : undefined}
        className={clsx(
          'w-full rounded-md border bg-canvas px-3 py-2 text-ink placeholder:text-muted/60',
          bad ? 'border-fail' : 'border-line focus:border-beam',
        )}
        {...rest}
      />
      {hint && !bad ? <span className="mt-1 block text-xs text-muted">{hint}</span> : null}
      {bad ? (
        <span id={errId} role="alert" className="mt-1 block text-xs text-fail">
          {errors.join(' ')}
        </span>
      ) : null}
    </label>
  );
}
