import { Panel } from '@/components/ui/panel';

/** The safety notes that belong beside the patterns shown on a device. */
export function CaptureCautions() {
  return (
    <Panel title="Before you show a pattern">
      <ul data-testid="pattern-cautions" className="space-y-3 text-sm">
        <li className="border-l-2 border-warn/70 pl-3">
          <p className="font-medium text-ink">Bright and laser light sources</p>
          <p className="text-muted">
            Full white at full drive is the brightest thing a display can show. Bright backlights and laser-based displays can exceed safe exposure: follow the light source’s
            safety class and its rules, and do not look into the optics for long at full level.
          </p>
        </li>
        <li className="border-l-2 border-warn/70 pl-3">
          <p className="font-medium text-ink">Keep the sun out of the optics</p>
          <p className="text-muted">
            When shooting against daylight, never point the optics, a magnifier or the camera lens at the sun: lenses concentrate sunlight, burn skin and displays, and can
            permanently damage eyes.
          </p>
        </li>
        <li className="border-l-2 border-warn/70 pl-3">
          <p className="font-medium text-ink">Not on the road</p>
          <p className="text-muted">Do not test a head-up display while driving or riding on public roads.</p>
        </li>
      </ul>
    </Panel>
  );
}
