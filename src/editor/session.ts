/**
 * The editor session around the document: loaded data, the latest solution, selection and messages.
 * Not undoable; the document store keeps it beside the undo history.
 */
import type { CatalogReadResult } from '../core/catalog/types';
import type { Problem } from '../core/result';
import type { SolveOutcome } from './worker/solverClient';
import type { MaskPose } from './view/SkyView';
import type { EditorDoc } from './store/document';

export interface LoadedFile {
  name: string;
  /** Text for text formats, bytes for binary ones (FITS); kept so autosave can restore it. */
  content: string | Uint8Array;
}

export interface Notice {
  id: number;
  level: 'info' | 'warning' | 'error';
  text: string;
  problems?: Problem[];
  /** A button on the notice: open the catalog's row report. */
  action?: 'show-rejects';
}

export interface SearchState {
  running: boolean;
  fraction: number;
  message: string;
}

export interface Session {
  catalog: CatalogReadResult | null;
  catalogFile: LoadedFile | null;
  planName: string;
  solution: SolveOutcome | null;
  /** The document the shown solution was solved for (null for a drag preview). */
  solvedDoc: EditorDoc | null;
  solving: boolean;
  solveError: { message: string; problems?: Problem[] } | null;
  /** Selected targets, as indices into catalog.targets. */
  selection: ReadonlySet<number>;
  activeMaskId: string | null;
  /** A mask being dragged or rotated and not yet committed. */
  preview: MaskPose | null;
  search: SearchState | null;
  notices: Notice[];
  /** Name of the FITS backdrop, with a message when it could not be used. */
  backdropName: string | null;
  /** When the document was last written to the browser's storage (ISO time), or null. */
  autosavedAt: string | null;
  /** Re-solve the moved mask on every step of a drag (true), or only when it is dropped (false: for slow machines). */
  liveDrag: boolean;
  /** A target the sky view should bring into view (catalog index; `n` counts the requests). */
  focus: { index: number; n: number } | null;
  /** PA snap for turning a mask with its handle, degrees (0: off). */
  paSnapDeg: number;
  /** Centre steps for typed and dragged mask centres: offsets from the galaxy centre in multiples of this, arcsec (0: exact). */
  centreSnapArcsec: number;
  /** Counts requests to open and show the catalog's row report. */
  revealRejects: number;
}

export function emptySession(): Session {
  return {
    catalog: null, catalogFile: null, planName: 'untitled.plan.json', solution: null, solvedDoc: null, solving: false, solveError: null,
    selection: new Set(), activeMaskId: null, preview: null, search: null, notices: [], backdropName: null, autosavedAt: null,
    liveDrag: true, focus: null, paSnapDeg: 0, centreSnapArcsec: 0, revealRejects: 0,
  };
}
