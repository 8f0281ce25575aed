import { Panel } from '@/components/ui/panel';

const CAUTIONS = [
  {
    title: 'Keep the sun out of the optics',
    text: 'Never point the stack, a magnifier or a camera lens at the sun. Lenses and curved combiners concentrate sunlight: they burn skin and displays and can permanently damage eyes.',
  },
  {
    title: 'Bright and laser light sources',
    text: 'A brighter panel raises the contrast on paper, but bright backlights and laser-based displays can exceed safe exposure. Follow the source’s safety class and its rules before turning it up.',
  },
  {
    title: 'Vehicle head-up displays',
    text: 'Do not test a head-up display while driving or riding on public roads. A HUD fitted to a vehicle must meet the local vehicle rules.',
  },
  {
    title: 'Estimates, not certification',
    text: 'These predictions and the measurements from photos are engineering estimates. For compliance, follow the applicable standard and local codes and use a licensed test laboratory.',
  },
];

/** The safety notes that belong beside the planner. */
export function PlannerCautions() {
  return (
    <Panel title="Before you build or test">
      <ul data-testid="planner-cautions" className="space-y-3 text-sm">
        {CAUTIONS.map((c) => (
          <li key={c.title} className="border-l-2 border-warn/70 pl-3">
            <p className="font-medium text-ink">{c.title}</p>
            <p className="text-muted">{c.text}</p>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
