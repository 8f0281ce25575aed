import clsx from 'clsx';
import type { ButtonHTMLAttributes } from 'react';

type Tone = 'primary' | 'quiet' | 'danger';

const TONES: Record<Tone, string> = {
  primary: 'bg-beam text-canvas hover:bg-beam/85 font-semibold',
  quiet: 'border border-line bg-raised text-ink hover:border-beam/60',
  danger: 'border border-fail/50 bg-fail/10 text-fail hover:bg-fail/20',
};

export function Button({ tone = 'primary', className, ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { tone?: Tone }) {
  return (
    <button
      {...rest}
      className={clsx(
        'inline-flex items-center justify-center gap-2 rounded-md px-3 py-1.5 text-sm transition disabled:cursor-not-allowed disabled:opacity-50',
        TONES[tone],
        className,
      )}
    />
  );
}
