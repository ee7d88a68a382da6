/**
 * File-system faults in the user's words: a Node system error (EACCES, ENOTDIR, EROFS...) turned into one Problem
 * saying what failed, where, and how to fix it, so no file-system fault ever reaches the user as a stack trace.
 */
import { existsSync, lstatSync, statSync } from 'node:fs';
import { dirname } from 'node:path';
import { InputError, type Problem } from '../core/result';

/** A Node system error (it carries an errno code such as 'EACCES'). */
export function isSystemError(e: unknown): e is NodeJS.ErrnoException {
  return e instanceof Error && typeof (e as NodeJS.ErrnoException).code === 'string' && /^E[A-Z]+$/.test((e as NodeJS.ErrnoException).code!);
}

/** What a system error code means for the place being written or read, and what the user can do about it. */
const CODES: Record<string, { what: string; fix: string }> = {
  EACCES: { what: 'permission denied', fix: 'choose a place you may write to, or ask for write permission there' },
  EPERM: { what: 'the operation is not permitted there', fix: 'choose a place you may write to' },
  EROFS: { what: 'is on a read-only file system', fix: 'choose a place on a writable disk' },
  ENOTDIR: { what: 'a part of the path is a file, not a folder', fix: 'choose a path whose parent folders are folders' },
  EISDIR: { what: 'is a folder', fix: 'give a file name, not a folder' },
  ENOENT: { what: 'a folder on the path does not exist and cannot be made there', fix: 'choose a path in an ordinary folder you may write to' },
  ENOSPC: { what: 'the disk is full', fix: 'free some space or choose another disk' },
  EDQUOT: { what: 'your disk quota is exhausted', fix: 'free some space or choose another disk' },
  EEXIST: { what: 'was created by another run at the same moment', fix: 'run again when the other run has finished, or choose another place' },
  ENOTEMPTY: { what: 'was filled by another run at the same moment', fix: 'run again when the other run has finished, or choose another place' },
  ENAMETOOLONG: { what: 'the path is too long', fix: 'choose a shorter path' },
  EMFILE: { what: 'too many files are open', fix: 'close other programs and run again' },
  EIO: { what: 'the disk reported an input/output error', fix: 'check the disk, or choose another place' },
  EBUSY: { what: 'is in use by another program', fix: 'close the other program or choose another place' },
  EXDEV: { what: 'the temporary files and the destination are on different disks', fix: 'choose a destination on the same disk as its parent folder' },
};

/** One Problem for a system error met while doing `action` (e.g. "cannot write the output folder") at `where`. */
export function systemErrorProblem(e: NodeJS.ErrnoException, where: string, action: string): Problem {
  const known = CODES[e.code ?? ''];
  // A temporary name of ours means nothing to the user: name the folder it was to be made in.
  const path = e.path && /((\.tmp-|\.old-|\.haloweave-partial-)\d+-[0-9a-z]+|\.\d+\.[0-9a-z]+\.tmp)$/.test(e.path) ? dirname(e.path) : e.path;
  const at = path && !where.endsWith(path) ? ` (in ${path})` : '';
  if (known) return { where, what: `${action}: ${known.what}${at}`, fix: known.fix };
  return { where, what: `${action}: ${e.code} ${e.syscall ?? ''}${at}`.trim(), fix: 'choose another place, or check the disk' };
}

/** Run `f`; a system error becomes an InputError with one line (what, where, how to fix); other errors pass. */
export function withFsProblems<T>(where: string, action: string, f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (isSystemError(e)) throw new InputError([systemErrorProblem(e, where, action)]);
    throw e;
  }
}

/** The nearest existing folder-or-file on the way up from `path` when it is a file (nothing can be made under it), else null. */
export function fileOnPath(path: string): string | null {
  for (let p = path; ; p = dirname(p)) {
    let isDir: boolean;
    try {
      const st = lstatSync(p);
      isDir = st.isDirectory() || (st.isSymbolicLink() && existsSync(p) && statSync(p).isDirectory());
    } catch {
      if (dirname(p) === p) return null;
      continue;
    }
    return isDir ? null : p;
  }
}
