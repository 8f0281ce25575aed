const STEPS = [
  'Camera on a tripod at the eye point; nothing moves between the photos.',
  'Manual exposure, manual focus, fixed white balance.',
  'No HDR, night or scene modes.',
  'Same settings for on and off (unless you bracket the exposure on purpose).',
  'Avoid clipping: the brightest part of the screen must stay below full scale. The reading warns when it does not.',
  'Raw is best: upload the camera’s raw files (DNG, CR2, CR3, NEF, ARW, RAF, ORF, RW2, PEF, SRW) as they are, no conversion step. Camera JPEG is accepted.',
  'Show the test pattern fullscreen from the Test patterns page.',
  'Ambient photo: same scene and settings with the optics taken out of the path.',
];

const CAUTIONS = [
  'Never point the optics, a magnifier or a camera lens at the sun: lenses concentrate sunlight, burn skin and displays, and can permanently damage eyes.',
  'Bright backlights and laser-based displays can exceed safe exposure: follow the light source’s safety class and its rules.',
  'Do not test a head-up display while driving or riding on public roads; a HUD fitted to a vehicle must meet the local vehicle rules.',
  'Numbers from photos are engineering estimates, not certification: for compliance, defer to the applicable standard, local codes and a licensed test laboratory.',
];

export function ProtocolChecklist() {
  return (
    <div className="space-y-4 text-sm">
      <div>
        <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">Before you shoot</h3>
        <ul className="space-y-1.5">
          {STEPS.map((s) => (
            <li key={s} className="flex gap-2">
              <span aria-hidden className="mt-1.5 h-1.5 w-1.5 shrink-0 rounded-full bg-beam" />
              <span className="text-ink">{s}</span>
            </li>
          ))}
        </ul>
      </div>
      <div className="rounded-md border border-warn/50 bg-warn/10 p-3" role="note" aria-label="Safety cautions">
        <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-warn">Take care</h3>
        <ul className="space-y-1.5">
          {CAUTIONS.map((c) => (
            <li key={c} className="text-ink">
              {c}
            </li>
          ))}
        </ul>
      </div>
    </div>
  );
}
