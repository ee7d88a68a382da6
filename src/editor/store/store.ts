/**
 * The one document store of the editor: the undo history of the document plus the session around it
 * (loaded catalog, selection, latest solution). Plain TypeScript with subscribe/getState, so it runs
 * in node tests as well as behind React's useSyncExternalStore.
 */
import type { Command } from './commands';
import type { EditorDoc } from './document';
import { perform, redo, startHistory, undo, type History } from './history';

/** Where the document stands against its last save (or its opening). */
export interface SavePoint {
  depth: number;
  top: Command | undefined;
}

export interface StoreState<S> {
  history: History;
  saved: SavePoint;
  /** Session state that undo does not touch (selection, loaded data, solution, messages). */
  session: S;
}

export type Listener = () => void;

export class DocumentStore<S> {
  private state: StoreState<S>;
  private listeners = new Set<Listener>();

  constructor(doc: EditorDoc, session: S) {
    this.state = { history: startHistory(doc), saved: { depth: 0, top: undefined }, session };
  }

  /** The current state object (a new object after every change, so it can be compared by identity). */
  getState = (): StoreState<S> => this.state;

  /** Register a listener called after every change; returns the function that removes it. */
  subscribe = (fn: Listener): (() => void) => {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  };

  get doc(): EditorDoc {
    return this.state.history.doc;
  }

  get session(): S {
    return this.state.session;
  }

  private set(next: StoreState<S>): void {
    if (next === this.state) return;
    this.state = next;
    for (const fn of [...this.listeners]) fn();
  }

  /** Do an undoable command. */
  dispatch(cmd: Command): void {
    this.set({ ...this.state, history: perform(this.state.history, cmd) });
  }

  /** Build a command from the current document and do it (the command captures what it replaces). */
  run(make: (doc: EditorDoc) => Command): void {
    this.dispatch(make(this.doc));
  }

  undo(): void {
    const h = undo(this.state.history);
    if (h !== this.state.history) this.set({ ...this.state, history: h });
  }

  redo(): void {
    const h = redo(this.state.history);
    if (h !== this.state.history) this.set({ ...this.state, history: h });
  }

  get canUndo(): boolean {
    return this.state.history.past.length > 0;
  }

  get canRedo(): boolean {
    return this.state.history.future.length > 0;
  }

  /** True when the document differs from its last save or opening. */
  get dirty(): boolean {
    const { past } = this.state.history;
    return past.length !== this.state.saved.depth || past[past.length - 1] !== this.state.saved.top;
  }

  /** Mark the current document as saved. */
  markSaved(): void {
    const { past } = this.state.history;
    this.set({ ...this.state, saved: { depth: past.length, top: past[past.length - 1] } });
  }

  /** Start over with a new document (opening a file): the history is cleared. `dirty` says whether it is unsaved. */
  replaceDocument(doc: EditorDoc, opts: { dirty?: boolean } = {}): void {
    const history = startHistory(doc);
    this.set({ ...this.state, history, saved: opts.dirty ? { depth: -1, top: undefined } : { depth: 0, top: undefined } });
  }

  /** Change session state (not undoable). */
  updateSession(change: (s: S) => S): void {
    const session = change(this.state.session);
    if (session !== this.state.session) this.set({ ...this.state, session });
  }
}
