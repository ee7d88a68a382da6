/**
 * The spectrographs of a plan (interface contract, revision 2): either one `instrument` for every mask, or
 * `instruments: [{profile, masks}]` sharing the masks out, where a mask in `masks` may name its own `instrument`
 * (one of the `profile` values, or the id of that profile). Masks that name none fill the instruments' remaining
 * counts in the order the instruments are listed. Pure: profiles are passed in, already loaded.
 */
import { InputError, type Problem } from '../result';
import type { InstrumentProfile } from '../profile/schema';
import type { PlanFile } from './schema';

/** The profile references (ids or paths) a plan names, each once, in plan order. */
export function planInstrumentRefs(plan: Pick<PlanFile, 'instrument' | 'instruments'>): string[] {
  if (plan.instruments?.length) return [...new Set(plan.instruments.map((i) => i.profile))];
  return plan.instrument ? [plan.instrument] : [];
}

/** True when a plan shares its masks between several spectrographs (an `instruments` list of two or more). */
export function isMixedPlan(plan: Pick<PlanFile, 'instruments'>): boolean {
  return planInstrumentRefs({ instruments: plan.instruments }).length > 1;
}

/** Problems of the instrument keys that need no profile: one of instrument/instruments, counts adding up to goals.masks. */
export function instrumentKeyProblems(plan: PlanFile, source: string): Problem[] {
  const problems: Problem[] = [];
  if (plan.instrument !== undefined && plan.instruments !== undefined) {
    problems.push({ where: `${source}: instruments`, what: 'the plan gives both "instrument" and "instruments"', fix: 'keep "instrument" for a single spectrograph, or "instruments" to share the masks between several' });
  } else if (plan.instrument === undefined && plan.instruments === undefined) {
    problems.push({ where: `${source}: instrument`, what: 'no spectrograph named', fix: 'add "instrument": "<profile id or path>", or "instruments": [{"profile": "...", "masks": 2}, ...]' });
  }
  if (!plan.instruments) return problems;
  const seen = new Set<string>();
  plan.instruments.forEach((i, k) => {
    if (seen.has(i.profile)) problems.push({ where: `${source}: instruments.${k}.profile`, what: `"${i.profile}" is listed twice`, fix: 'list each spectrograph once, with the sum of its masks' });
    seen.add(i.profile);
  });
  const total = plan.instruments.reduce((a, i) => a + i.masks, 0);
  if (total !== plan.goals.masks) {
    problems.push({
      where: `${source}: instruments`,
      what: `the instruments take ${plan.instruments.map((i) => i.masks).join(' + ')} = ${total} masks but goals.masks is ${plan.goals.masks}`,
      fix: 'make goals.masks the sum of the instruments\' masks',
    });
  }
  return problems;
}

/**
 * The profile reference of each mask id (in the order given): a mask's own `instrument` (a reference, or the id of a
 * loaded profile), else the next instrument with masks left. Throws InputError for a mask naming a spectrograph
 * the plan does not list, or an instrument given more masks than its count.
 */
export function maskInstrumentRefs(plan: PlanFile, maskIds: readonly string[], profiles: Readonly<Record<string, InstrumentProfile>> = {}, source = 'plan'): string[] {
  const refs = planInstrumentRefs(plan);
  if (!plan.instruments?.length) return maskIds.map(() => refs[0] ?? '');
  const left = new Map<string, number>();
  for (const i of plan.instruments) left.set(i.profile, (left.get(i.profile) ?? 0) + i.masks);
  const given = new Map((plan.masks ?? []).map((m, k) => [m.id, { m, k }]));
  const problems: Problem[] = [];
  const out: (string | null)[] = maskIds.map((id) => {
    const g = given.get(id);
    const name = g?.m.instrument;
    if (name === undefined) return null;
    const ref = refs.find((r) => r === name) ?? refs.find((r) => profiles[r]?.id === name);
    if (ref === undefined) {
      problems.push({ where: `${source}: masks.${g!.k}.instrument`, what: `mask ${id} names "${name}", which is not among the plan's instruments (${refs.join(', ')})`, fix: 'name one of the "instruments" profiles, by the same text or by its profile id' });
      return null;
    }
    const n = left.get(ref)!;
    if (n <= 0) problems.push({ where: `${source}: masks.${g!.k}.instrument`, what: `more masks name "${name}" than its ${plan.instruments!.find((i) => i.profile === ref)!.masks} in instruments`, fix: 'raise that instrument\'s "masks" (and goals.masks), or give the mask another instrument' });
    left.set(ref, n - 1);
    return ref;
  });
  if (problems.length) throw new InputError(problems);
  return out.map((r) => {
    if (r !== null) return r;
    const next = refs.find((ref) => left.get(ref)! > 0) ?? refs[refs.length - 1];
    left.set(next, left.get(next)! - 1);
    return next;
  });
}

/** Ids of every mask of a plan: its own masks' ids, then m1, m2... (skipping ids in use) up to goals.masks. */
export function planMaskIds(plan: Pick<PlanFile, 'masks' | 'goals'>): string[] {
  const ids = (plan.masks ?? []).map((m) => m.id);
  const used = new Set(ids);
  for (let i = 1; ids.length < plan.goals.masks; i++) if (!used.has(`m${i}`)) { ids.push(`m${i}`); used.add(`m${i}`); }
  return ids;
}

/**
 * A plan with several spectrographs made explicit: every mask listed (up to goals.masks, new ones as planMaskIds names
 * them, unplaced) with `instrument` set to its profile's id. `profiles` maps each of the plan's references to its
 * loaded profile. A plan with one spectrograph is returned as it is.
 */
export function planWithMaskInstruments(plan: PlanFile, profiles: Readonly<Record<string, InstrumentProfile>>, source = 'plan'): PlanFile {
  if (!plan.instruments?.length) return plan;
  const ids = planMaskIds(plan);
  const refs = maskInstrumentRefs(plan, ids, profiles, source);
  const given = new Map((plan.masks ?? []).map((m) => [m.id, m]));
  return { ...plan, masks: ids.map((id, k) => ({ ...(given.get(id) ?? { id }), instrument: profiles[refs[k]]?.id ?? refs[k] })) };
}

/** The plan's entry for spectrograph `profileId` (plan key instruments): the first naming that id or a file of that profile. */
export function instrumentEntry(plan: Pick<PlanFile, 'instruments'>, profileId: string, profiles: Readonly<Record<string, InstrumentProfile>> = {}): NonNullable<PlanFile['instruments']>[number] | undefined {
  return plan.instruments?.find((e) => e.profile === profileId || profiles[e.profile]?.id === profileId);
}

/**
 * The plan's `observing` and `starlight` sections as the masks of spectrograph `profileId` see them: the entry's own
 * `observing` keys over the plan's (key by key; a `moon` given there replaces the plan's whole), and its exposure time,
 * when it gives one, also the starlight exposure of its masks (a mask is one exposure). The plan's own sections when
 * the entry gives no `observing`.
 */
export function instrumentSections(plan: Pick<PlanFile, 'instruments' | 'observing' | 'starlight'>, profileId: string, profiles: Readonly<Record<string, InstrumentProfile>> = {}): Pick<PlanFile, 'observing' | 'starlight'> {
  const own = instrumentEntry(plan, profileId, profiles)?.observing;
  if (!own) return { observing: plan.observing, starlight: plan.starlight };
  return {
    observing: { ...plan.observing, ...own },
    starlight: own.exposureTimeS !== undefined ? { ...plan.starlight, exposureS: own.exposureTimeS } : plan.starlight,
  };
}

/** The distinct profiles of a plan, in the order its references list them (problems when two files share an id). */
export function planProfiles(plan: PlanFile, profiles: Readonly<Record<string, InstrumentProfile>>, source = 'plan'): InstrumentProfile[] {
  const out: InstrumentProfile[] = [];
  const problems: Problem[] = [];
  for (const ref of planInstrumentRefs(plan)) {
    const p = profiles[ref];
    if (!p) { problems.push({ where: `${source}: instruments`, what: `the profile "${ref}" is not loaded` }); continue; }
    const same = out.find((q) => q.id === p.id);
    if (same && same !== p && JSON.stringify(same) !== JSON.stringify(p)) {
      problems.push({ where: `${source}: instruments`, what: `two different profiles have the id "${p.id}"`, fix: 'give each profile file an id of its own: masks.csv names each mask\'s profile by id' });
    }
    if (!same) out.push(p);
  }
  if (problems.length) throw new InputError(problems);
  return out;
}
