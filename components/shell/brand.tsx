/** Veilmeter's mark: a tilted plate with a reflected and a transmitted ray. */
export function Brand({ small = false }: { small?: boolean }) {
  const s = small ? 22 : 30;
  return (
    <span className="inline-flex items-center gap-2">
      <svg width={s} height={s} viewBox="0 0 32 32" aria-hidden>
        <rect x="1" y="1" width="30" height="30" rx="7" className="fill-raised stroke-line" />
        <line x1="9" y1="24" x2="23" y2="8" className="stroke-ink" strokeWidth="2.2" strokeLinecap="round" />
        <path d="M3 16 H16 V4" fill="none" className="stroke-glow" strokeWidth="1.8" strokeLinecap="round" />
        <path d="M16 16 H29" fill="none" className="stroke-beam" strokeWidth="1.8" strokeLinecap="round" strokeDasharray="2 2.4" />
      </svg>
      <span className={small ? 'text-sm font-semibold tracking-wide' : 'text-lg font-semibold tracking-wide'}>Veilmeter</span>
    </span>
  );
}
