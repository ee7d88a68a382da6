/**
 * Cross-file check of a plan with several spectrographs (plan key `instruments`): each masks.csv `instrument` is the
 * profile id of one of the plan's instruments, each instrument has exactly its `masks` count of masks, and a
 * solved.plan.json mask naming its own `instrument` names the profile masks.csv gives it.
 */
import type { PlanFile } from '../plan/schema';
import type { CheckedMask, Violation } from './checkOutput';

/** Violations of the instrument counts and names of an output folder (none for a plan of one spectrograph). */
export function checkPlanInstruments(plan: PlanFile, masks: readonly CheckedMask[], idOfRef: (ref: string) => string | null, opts: { planSource?: string; masksSource?: string; maskLines?: readonly number[] } = {}): Violation[] {
  if (!plan.instruments?.length) return [];
  const planSrc = opts.planSource ?? 'solved.plan.json', masksSrc = opts.masksSource ?? 'masks.csv';
  const out: Violation[] = [];
  const wanted = new Map<string, number>();
  plan.instruments.forEach((i, k) => {
    const id = idOfRef(i.profile);
    if (id === null) out.push({ where: `${planSrc} instruments.${k}.profile`, rule: 'instruments', what: `the profile "${i.profile}" cannot be found` });
    else wanted.set(id, (wanted.get(id) ?? 0) + i.masks);
  });
  const counts = new Map<string, number>();
  masks.forEach((m, i) => {
    counts.set(m.instrument, (counts.get(m.instrument) ?? 0) + 1);
    if (!wanted.has(m.instrument)) out.push({ where: `${masksSrc} line ${opts.maskLines?.[i] ?? i + 2} (mask ${m.maskId})`, rule: 'instruments', what: `instrument "${m.instrument}" is not one of the plan's instruments (${[...wanted.keys()].join(', ')})` });
  });
  for (const [id, n] of wanted) {
    if ((counts.get(id) ?? 0) !== n) out.push({ where: masksSrc, rule: 'instruments', what: `${counts.get(id) ?? 0} masks use "${id}", the plan's instruments give it ${n}` });
  }
  const byId = new Map(masks.map((m) => [m.maskId, m]));
  (plan.masks ?? []).forEach((pm, k) => {
    const row = byId.get(pm.id);
    if (pm.instrument === undefined || !row) return;
    if (row.instrument !== pm.instrument && row.instrument !== idOfRef(pm.instrument)) {
      out.push({ where: `${planSrc} masks[${k}] (id ${pm.id}).instrument`, rule: 'instruments', what: `"${pm.instrument}", but ${masksSrc} gives "${row.instrument}"` });
    }
  });
  return out;
}
