/** The instrument profiles shipped in instrument-profiles/, bundled by Vite and validated by the core loader. */
import { parseProfile } from '../../core/profile/load';
import type { InstrumentProfile } from '../../core/profile/schema';

const files = import.meta.glob('/instrument-profiles/*.json', { eager: true, import: 'default' }) as Record<string, unknown>;

/** Every bundled profile that validates, by id (a broken file is reported once on the console, not hidden). */
export const BUNDLED_PROFILES: ReadonlyMap<string, InstrumentProfile> = (() => {
  const map = new Map<string, InstrumentProfile>();
  for (const [path, json] of Object.entries(files)) {
    try {
      const p = parseProfile(json, path.slice(1));
      map.set(p.id, p);
    } catch (e) {
      console.error(`bundled profile ${path} is not valid:`, e);
    }
  }
  return map;
})();

/** The bundled profile a plan's `instrument` names: an id, or a path whose file name (without .json) is an id. */
export function bundledProfileFor(instrument: string): InstrumentProfile | undefined {
  const direct = BUNDLED_PROFILES.get(instrument);
  if (direct) return direct;
  const base = instrument.split(/[\\/]/).pop()!.replace(/\.json$/i, '');
  return BUNDLED_PROFILES.get(base);
}
