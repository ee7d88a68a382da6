/**
 * Autosave in the browser (IndexedDB): the document, the catalog file it was solved with and the
 * plan's file name, written shortly after every change and read back on start, so a reload or a
 * crashed tab comes back where it was. One record, key "current".
 */
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { LoadedFile } from '../session';

export interface AutosaveRecord {
  version: 1;
  savedAt: string;
  plan: PlanFile;
  profile: InstrumentProfile;
  planName: string;
  catalogFile: LoadedFile | null;
  /** True when the work had changes not yet saved to a plan file. */
  unsaved: boolean;
}

const DB = 'haloweave-editor';
const STORE = 'autosave';
const KEY = 'current';

function openDb(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB, 1);
    req.onupgradeneeded = () => req.result.createObjectStore(STORE);
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

async function withStore<T>(mode: IDBTransactionMode, f: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await openDb();
  try {
    return await new Promise<T>((resolve, reject) => {
      const tx = db.transaction(STORE, mode);
      const req = f(tx.objectStore(STORE));
      tx.oncomplete = () => resolve(req.result);
      tx.onerror = () => reject(tx.error);
      tx.onabort = () => reject(tx.error);
    });
  } finally {
    db.close();
  }
}

/** Write the autosave record (replaces the previous one). */
export function writeAutosave(rec: AutosaveRecord): Promise<unknown> {
  return withStore('readwrite', (s) => s.put(rec, KEY));
}

/** The autosave record, or null when there is none or it is of an unknown version. */
export async function readAutosave(): Promise<AutosaveRecord | null> {
  try {
    const rec = (await withStore('readonly', (s) => s.get(KEY))) as AutosaveRecord | undefined;
    return rec && rec.version === 1 && rec.plan && rec.profile ? rec : null;
  } catch {
    return null;
  }
}

/** Remove the autosave record (start afresh with the demo). */
export function clearAutosave(): Promise<unknown> {
  return withStore('readwrite', (s) => s.delete(KEY));
}
