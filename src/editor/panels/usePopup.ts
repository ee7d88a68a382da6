/** Closing behaviour shared by every popup of the editor: Escape, or a press anywhere outside the popup and its opener. */
import { useEffect, type RefObject } from 'react';

/** While `open`, close (call `close`) on Escape or on a pointer press outside `root` (the opener and its popup). */
export function useDismissable(open: boolean, root: RefObject<HTMLElement | null>, close: () => void): void {
  useEffect(() => {
    if (!open) return;
    const onDown = (e: PointerEvent) => {
      if (root.current && e.target instanceof Node && root.current.contains(e.target)) return;
      close();
    };
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== 'Escape') return;
      e.preventDefault();
      close();
    };
    // Capture phase: the sky view's canvas handles presses itself and must not keep the menu open over a drag.
    document.addEventListener('pointerdown', onDown, true);
    document.addEventListener('keydown', onKey, true);
    return () => {
      document.removeEventListener('pointerdown', onDown, true);
      document.removeEventListener('keydown', onKey, true);
    };
  }, [open, root, close]);
}
