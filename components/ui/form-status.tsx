import clsx from 'clsx';
import type { FormState } from '@/lib/form-state';

/** A form's answer beside its button: announced politely on success, at once on failure. */
export function FormStatus({ state, small = false }: { state: FormState; small?: boolean }) {
  if (!state.message) return null;
  return (
    <span role={state.ok ? 'status' : 'alert'} className={clsx(small ? 'text-xs' : 'text-sm', state.ok ? 'text-pass' : 'text-fail')}>
      {state.message}
    </span>
  );
}
