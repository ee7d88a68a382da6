/**
 * Give a mask another spectrograph in a plan with several (plan key `instruments`): the mask's `instrument` becomes the
 * new profile reference and the two instruments' mask counts follow (one fewer on the old, one more on the new), so
 * they still add up to goals.masks. Undo puts the mask and the counts back as they were.
 */
import type { PlanFile } from '../../core/plan/schema';
import { maskIndex, type EditorDoc } from './document';
import type { Command } from './commands';
import { maskInstrumentRefs, planMaskIds } from '../../core/plan/instruments';

/** The command changing mask `maskId` to the plan instrument `ref` (one of `instruments[].profile`). */
export function setMaskInstrumentCommand(doc: EditorDoc, maskId: string, ref: string): Command {
  const i = maskIndex(doc.plan, maskId);
  const instruments = doc.plan.instruments;
  if (i < 0 || !instruments) throw new Error(`no mask "${maskId}" in a plan with instruments`);
  const target = instruments.findIndex((x) => x.profile === ref);
  if (target < 0) throw new Error(`"${ref}" is not one of the plan's instruments`);
  const beforeMask = doc.plan.masks![i];
  const beforeInstruments = instruments;
  // The instrument the mask has now: its own, else the one the share-out gives it (plan/instruments.ts).
  let currentRef = instrumentRef(instruments, beforeMask.instrument);
  if (currentRef === '') {
    try {
      currentRef = maskInstrumentRefs(doc.plan, planMaskIds(doc.plan))[i];
    } catch {
      currentRef = '';
    }
  }
  const from = instruments.findIndex((x) => x.profile === currentRef);
  const afterInstruments = instruments.map((x, k) => ({ ...x, masks: x.masks + (k === target ? 1 : 0) - (k === from && from !== target ? 1 : 0) }));
  const apply = (plan: PlanFile, mask: typeof beforeMask, list: typeof instruments): PlanFile => {
    const masks = plan.masks!.slice();
    masks[maskIndex(plan, maskId)] = mask;
    return { ...plan, masks, instruments: list };
  };
  return {
    label: `mask ${maskId} on ${ref}`,
    do: (d) => ({ ...d, plan: apply(d.plan, { ...beforeMask, instrument: ref }, from >= 0 ? afterInstruments : instruments) }),
    undo: (d) => ({ ...d, plan: apply(d.plan, beforeMask, beforeInstruments) }),
  };
}

/**
 * The plan reference a mask's `instrument` stands for: the same text, or a reference whose file name is that profile
 * id (solved plans name each mask's profile by id); '' when the mask names none.
 */
export function instrumentRef(instruments: readonly { profile: string }[], instrument: string | undefined): string {
  if (instrument === undefined) return '';
  return instruments.find((x) => x.profile === instrument || x.profile.replace(/^.*[\\/]/, '').replace(/\.json$/i, '') === instrument)?.profile ?? '';
}
