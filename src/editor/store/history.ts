/**
 * Linear undo history over the editor document: `past` holds done commands (latest last),
 * `future` holds undone ones (next redo last). Doing a new command clears the future.
 */
import type { EditorDoc } from './document';
import type { Command } from './commands';

export interface History {
  doc: EditorDoc;
  past: Command[];
  future: Command[];
  /** Counts every change of `doc` (do, undo, redo), so the store can tell a saved state from an edited one. */
  revision: number;
}

/** A fresh history whose starting point is `doc`. */
export function startHistory(doc: EditorDoc): History {
  return { doc, past: [], future: [], revision: 0 };
}

/** Do a command: the document changes, the command joins `past`, and `future` is cleared. */
export function perform(h: History, cmd: Command): History {
  return { doc: cmd.do(h.doc), past: [...h.past, cmd], future: [], revision: h.revision + 1 };
}

/** Undo the latest command; unchanged when there is nothing to undo. */
export function undo(h: History): History {
  const cmd = h.past[h.past.length - 1];
  if (!cmd) return h;
  return { doc: cmd.undo(h.doc), past: h.past.slice(0, -1), future: [...h.future, cmd], revision: h.revision + 1 };
}

/** Redo the latest undone command; unchanged when there is nothing to redo. */
export function redo(h: History): History {
  const cmd = h.future[h.future.length - 1];
  if (!cmd) return h;
  return { doc: cmd.do(h.doc), past: [...h.past, cmd], future: h.future.slice(0, -1), revision: h.revision + 1 };
}
