import { z } from 'zod';

export const PHOTO_ROLES = ['on', 'off', 'ambient', 'dark'] as const;
export type PhotoRole = (typeof PHOTO_ROLES)[number];
export const photoRoleSchema = z.enum(PHOTO_ROLES, { message: 'The role is on, off, ambient or dark' });

/** Largest file accepted per photo. */
export const MAX_UPLOAD_BYTES = 60 * 1024 * 1024;
/** Largest photo accepted, in pixels (the engine's own limit). */
export const MAX_UPLOAD_PIXELS = 100_000_000;

export const ROLE_LABELS: Record<PhotoRole, string> = {
  on: 'Display on',
  off: 'Display off',
  ambient: 'Without optics',
  dark: 'Dark room',
};

export const ROLE_HINTS: Record<PhotoRole, string> = {
  on: 'Test pattern showing, room lit as under test',
  off: 'Same camera and settings, display dark',
  ambient: 'Same scene, optics out of the path',
  dark: 'Optional: display on, room dark',
};

// Words that testers put in file names; checked on word boundaries so "offset" is not "off".
const ROLE_WORDS: [PhotoRole, RegExp][] = [
  ['ambient', /(^|[^a-z])(ambient|world|nooptics|no-optics|without|reference|ref|bare)([^a-z]|$)/],
  ['dark', /(^|[^a-z])(dark|darkroom|night|lights-?off)([^a-z]|$)/],
  ['off', /(^|[^a-z])(off|display-?off|blank|disp-?off)([^a-z]|$)/],
  ['on', /(^|[^a-z])(on|display-?on|disp-?on|lit|pattern)([^a-z]|$)/],
];

/** The photo role a file name suggests, or null when it names none (or several). */
export function roleFromFileName(name: string): PhotoRole | null {
  const base = name.toLowerCase().replace(/\.[a-z0-9]+$/, '');
  // "lights-off" names a dark room, not a display that is off
  const hits = ROLE_WORDS.filter(([, re]) => re.test(base)).map(([role]) => role);
  if (hits.includes('dark')) return 'dark';
  const unique = [...new Set(hits)];
  if (unique.length === 1) return unique[0] ?? null;
  // "display-on … off-axis" style names: prefer the explicit display word
  if (/display-?on|disp-?on/.test(base)) return 'on';
  if (/display-?off|disp-?off/.test(base)) return 'off';
  return null;
}
