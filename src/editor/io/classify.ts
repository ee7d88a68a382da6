/**
 * Tells what a file a user opened or dropped is, from its content (not only its name):
 * a plan file, an instrument profile, a FITS image, or a catalog (any table format the core reads).
 */
import { decodeText } from '../../core/catalog/textDecoding';

export type FileKind = 'plan' | 'profile' | 'image' | 'catalog';

const FITS_START = 'SIMPLE  =';

/** The 80-character header cards of every HDU header found in the first part of a FITS file. */
function fitsHeaderText(bytes: Uint8Array): string {
  const n = Math.min(bytes.length, 2880 * 40);
  let s = '';
  for (let i = 0; i < n; i++) s += String.fromCharCode(bytes[i]);
  return s;
}

/** Kind of a file from its bytes (and name as a tie-breaker for JSON). */
export function classifyFile(name: string, bytes: Uint8Array): FileKind {
  const head = decodeText(bytes.subarray(0, 64)).text.replace(/^\uFEFF/, '');
  if (head.startsWith(FITS_START)) {
    const text = fitsHeaderText(bytes);
    return /XTENSION= *'BINTABLE'/.test(text) ? 'catalog' : 'image';
  }
  if (head.trimStart().startsWith('{')) {
    try {
      const json = JSON.parse(decodeText(bytes).text) as Record<string, unknown>;
      if (typeof json.format === 'string' && json.format.startsWith('haloweave.plan/')) return 'plan';
      if ('footprint' in json && 'detector' in json) return 'profile';
      if ('galaxy' in json && 'goals' in json) return 'plan';
    } catch { /* not JSON after all: a catalog reader will say what is wrong */ }
    return /\.plan\.json$/i.test(name) ? 'plan' : 'profile';
  }
  return 'catalog';
}
