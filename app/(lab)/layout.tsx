import { Brand } from '@/components/shell/brand';
import { NavLinks } from '@/components/shell/nav-links';
import { SignOutButton } from '@/components/shell/sign-out-button';
import { ROLE_LABELS } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { switchLabAction, toggleThemeAction } from './shell-actions';

export default async function LabLayout({ children }: { children: React.ReactNode }) {
  const actor = await requireActor();
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[15rem_1fr]">
      <aside className="flex flex-col gap-6 border-b border-line bg-panel px-4 py-4 lg:sticky lg:top-0 lg:h-screen lg:border-b-0 lg:border-r">
        <Brand small />
        <div className="text-xs">
          <div className="mb-1 uppercase tracking-[0.18em] text-muted">Lab</div>
          {actor.memberships.length > 1 ? (
            <form action={switchLabAction} className="flex gap-1">
              <select name="labId" defaultValue={actor.labId} aria-label="Switch lab" className="min-w-0 flex-1 rounded-md border border-line bg-canvas px-2 py-1 text-sm text-ink">
                {actor.memberships.map((m) => (
                  <option key={m.labId} value={m.labId}>
                    {m.labName} ({ROLE_LABELS[m.role]})
                  </option>
                ))}
              </select>
              <button type="submit" className="rounded-md border border-line px-2 text-muted hover:text-ink">
                Go
              </button>
            </form>
          ) : (
            <div className="text-sm text-ink">{actor.labName}</div>
          )}
        </div>
        <NavLinks />
        <div className="mt-auto space-y-2 border-t border-line pt-4 text-xs">
          <div className="text-ink">{actor.user.name}</div>
          <div className="text-muted">
            {actor.user.email} · <span data-testid="role">{ROLE_LABELS[actor.role]}</span>
          </div>
          <div className="flex items-center justify-between">
            <form action={toggleThemeAction}>
              <button type="submit" className="text-muted hover:text-ink">
                Light / dark
              </button>
            </form>
            <SignOutButton />
          </div>
        </div>
      </aside>
      {/* a grid's items may shrink below their content (a wide table scrolls inside its panel, a
          chart takes the width it is given) and a long word or id wraps, so no page scrolls sideways */}
      <main className="min-w-0 break-words px-5 py-6 lg:px-10 lg:py-8 [&_.grid>*]:min-w-0">{children}</main>
    </div>
  );
}
