/** React binding of the editor controller: re-render whenever the controller reports a change. */
import { useSyncExternalStore } from 'react';
import type { EditorController } from './controller';

export function useControllerVersion(c: EditorController): number {
  return useSyncExternalStore(c.subscribe, c.getVersion);
}
