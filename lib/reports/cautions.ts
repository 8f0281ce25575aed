/** The cautions every report carries (docs/method.md §10), in the product's own words. */
export const REPORT_CAUTIONS = [
  'Never point the optics, a magnifier or a camera lens at the sun: lenses concentrate sunlight, burn skin and displays, and can permanently damage eyes.',
  'Bright backlights and laser-based displays can exceed safe exposure; follow the light source’s safety class and its rules.',
  'Do not test a head-up display while driving or riding on public roads; a HUD fitted to a vehicle must meet the local vehicle rules.',
  'Measurements from photos are engineering estimates, not certification; for compliance defer to the applicable standard, local codes and a licensed test laboratory.',
];
