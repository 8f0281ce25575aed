import { stackSchema, type Stack } from '../schemas/stack';

/** Identifiers of the starting stacks. */
export const STACK_TEMPLATE_IDS = [
  'single-combiner',
  'single-combiner-polariser',
  'birdbath',
  'birdbath-polariser',
] as const;

export type StackTemplateId = (typeof STACK_TEMPLATE_IDS)[number];

/** A starting stack for the editor. The numbers are plausible placeholders, not data of any part. */
export interface StackTemplate {
  id: StackTemplateId;
  name: string;
  description: string;
  stack: Stack;
}

const singleCombiner: Stack = {
  elements: [
    { kind: 'display', label: 'LCD panel', luminance: 8000, polarisation: { kind: 'linear', angleDeg: 0 } },
    { kind: 'magnifier', label: 'Relay lens', T: 0.92 },
    {
      kind: 'plate-beam-splitter',
      label: '30/68 plate at 45°',
      R: 0.3,
      T: 0.68,
      angleDeg: 45,
      n: 1.52,
      back: { kind: 'ar', R: 0.006 },
    },
  ],
};

const birdbath: Stack = {
  elements: [
    { kind: 'display', label: 'Micro-OLED', luminance: 3000, polarisation: { kind: 'none' } },
    {
      kind: 'plate-beam-splitter',
      label: '50/50 splitter',
      R: 0.48,
      T: 0.48,
      angleDeg: 45,
      n: 1.52,
      back: { kind: 'ar', R: 0.005 },
    },
    { kind: 'combiner', label: 'Curved combiner', shape: 'curved', R: 0.5, T: 0.47 },
  ],
};

const TEMPLATES: readonly StackTemplate[] = [
  {
    id: 'single-combiner',
    name: 'Single 45° combiner',
    description: 'A display under a tilted plate that reflects it towards the eye; one reflection, so the display must show a mirrored image.',
    stack: singleCombiner,
  },
  {
    id: 'single-combiner-polariser',
    name: 'Single 45° combiner with polariser',
    description:
      'The same plate with a polariser on the eye side aligned with the polarised display: the display keeps most of its light, the world loses about half.',
    stack: {
      elements: [
        ...singleCombiner.elements,
        { kind: 'linear-polariser', label: 'Eye-side polariser', T1: 0.86, T2: 0.0004, axisDeg: 0 },
      ],
    },
  },
  {
    id: 'birdbath',
    name: 'Birdbath',
    description: 'A splitter folds the display onto a curved combiner that reflects it back through the splitter; two reflections keep the image the right way round.',
    stack: birdbath,
  },
  {
    id: 'birdbath-polariser',
    name: 'Birdbath with world-side polariser',
    description: 'The birdbath with a polariser outside the combiner: it dims the world but not the display, raising contrast in bright surroundings.',
    stack: {
      elements: [
        ...birdbath.elements,
        { kind: 'linear-polariser', label: 'Visor polariser', T1: 0.88, T2: 0.001, axisDeg: 90, worldOnly: true },
      ],
    },
  },
];

/** All starting stacks, validated. */
export function listStackTemplates(): StackTemplate[] {
  return TEMPLATES.map((t) => ({ ...t, stack: stackSchema.parse(structuredClone(t.stack)) }));
}

/** One starting stack by id (a fresh copy, safe to edit). */
export function getStackTemplate(id: StackTemplateId): StackTemplate {
  const t = TEMPLATES.find((x) => x.id === id);
  if (!t) throw new RangeError(`Unknown stack template: ${String(id)}`);
  return { ...t, stack: stackSchema.parse(structuredClone(t.stack)) };
}
