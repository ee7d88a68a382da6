/**
 * Haloweave's own colour set for a dark sky view. The four slit roles use four hues that stay apart
 * under deuteranopia and protanopia (blue, magenta, orange, yellow-green: the blue-yellow axis that
 * red-green colour blindness keeps, with magenta and orange split by lightness), at clearly different
 * lightness steps (about L* 50, 62, 75, 88), and each role also has its own line style or shape,
 * so no reading depends on hue alone.
 */
import type { SlitRole } from '../../core/geometry/maskSolution';

export interface RoleStyle {
  colour: string;
  /** Canvas dash pattern in screen pixels; empty for a solid line. */
  dash: number[];
  /** How the role is marked in legends and charts. */
  mark: 'bar' | 'dashed bar' | 'dotted bar' | 'square';
  label: string;
}

export const ROLE_STYLE: Record<SlitRole, RoleStyle> = {
  tracer: { colour: '#3f7be0', dash: [], mark: 'bar', label: 'tracer slit' },
  alignment: { colour: '#d466c8', dash: [], mark: 'square', label: 'alignment box' },
  starlight: { colour: '#f5a13a', dash: [6, 3], mark: 'dashed bar', label: 'starlight slit' },
  sky: { colour: '#d4ea70', dash: [1.5, 2.5], mark: 'dotted bar', label: 'sky slit' },
};

export const ROLES: SlitRole[] = ['tracer', 'starlight', 'sky', 'alignment'];

export const INK = {
  background: '#12161d',
  backgroundEdge: '#0b0e13',
  grid: '#232a35',
  isophote: '#7d8796',
  isophoteGoal: '#b7c0cc',
  text: '#dde3ea',
  textDim: '#8c96a3',
  footprint: '#e9eef5',
  footprintFill: 'rgba(233, 238, 245, 0.05)',
  footprintActive: '#ffffff',
  selection: '#ffffff',
  excluded: '#6a717c',
  compass: '#dde3ea',
};

/** Grey-to-white shade of a tracer point by weight in [0, 1] (keeps hue free for roles). */
export function weightShade(weight01: number): string {
  const w = Math.max(0, Math.min(1, weight01));
  const l = Math.round(70 + w * 130);
  return `rgb(${l}, ${l + 4 > 255 ? 255 : l + 4}, ${l + 10 > 255 ? 255 : l + 10})`;
}

/** Number of discrete weight shades used when drawing the catalog in batches. */
export const SHADE_STEPS = 6;

/** The same four role hues, darkened for a white page (SVG charts for proposals); dash and shape as on screen. */
export const PRINT_ROLE_COLOUR: Record<SlitRole, string> = {
  tracer: '#1f57b8',
  alignment: '#a8329c',
  starlight: '#c46a12',
  sky: '#6f8c12',
};
