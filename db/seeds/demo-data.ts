// The invented demo lab: people, projects and revisions. No real people, brands or data.
export const DEMO_PASSWORD = 'kestrel-bench-42';
export const DEMO_LAB = 'Kestrel Row Optics Lab';

export const DEMO_PEOPLE = [
  { email: 'admin@example.test', name: 'Ada Varga', role: 'admin' },
  { email: 'lead@example.test', name: 'Tomas Lindqvist', role: 'lead' },
  { email: 'tester@example.test', name: 'Priya Okonkwo', role: 'tester' },
  { email: 'viewer@example.test', name: 'Jun Morel', role: 'viewer' },
] as const;

export const DEMO_PROJECTS = [
  {
    name: 'Visor VX birdbath',
    description: 'Indoor AR visor: 45° plate splitter, curved combiner, micro-OLED. Goal: readable at office and window light.',
    revisions: [
      { label: 'VX-A', builtOn: '2026-08-04', status: 'measured', notes: '50/50 splitter, bare back face.' },
      { label: 'VX-B', builtOn: '2026-09-15', status: 'measured', notes: '40/60 splitter, AR back face, measured with and without the polarizer.' },
      { label: 'VX-C', builtOn: '2026-11-02', status: 'built', notes: '30/70 splitter, brighter panel, with and without the polarizer.' },
    ],
    // the team's own targets (invented for the demo, like every value here)
    targets: [
      { metric: 'ambientContrastRatio', comparator: '>=', value: 2.5, conditionNote: 'office desk', condition: { ambientLuxMin: 200, ambientLuxMax: 1000 } },
      { metric: 'ghostRatio', comparator: '<=', value: 0.01, conditionNote: '', condition: { pattern: 'full' } },
      { metric: 'transmission', comparator: '>=', value: 0.3, conditionNote: 'see-through', condition: {} },
    ],
  },
  {
    name: 'Ridgeline M2 helmet HUD',
    description: 'Helmet HUD on a single flat combiner; bench rig only, never tested while riding.',
    revisions: [
      { label: 'M2-P1', builtOn: '2026-07-20', status: 'measured', notes: 'Uncoated polycarbonate combiner.' },
      { label: 'M2-P2', builtOn: '2026-10-10', status: 'planned', notes: 'Dielectric 25% coating planned.' },
    ],
    targets: [],
  },
] as const;
