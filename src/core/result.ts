/** A value or a problem a user can act on: what went wrong, where, and how to fix it. */
export type Result<T> = { ok: true; value: T } | { ok: false; error: string };

/** One problem in an input: `where` names the file, line or field; `what` says what is wrong. */
export interface Problem {
  where: string;
  what: string;
  fix?: string;
}

export const ok = <T>(value: T): Result<T> => ({ ok: true, value });
export const fail = <T = never>(error: string): Result<T> => ({ ok: false, error });

/** One line of text for a problem: "where: what (fix)". */
export function formatProblem(p: Problem): string {
  return `${p.where}: ${p.what}${p.fix ? ` (${p.fix})` : ''}`;
}

/** Thrown by loaders when input is unusable; carries every problem found, not just the first. */
export class InputError extends Error {
  constructor(public readonly problems: Problem[]) {
    super(problems.map(formatProblem).join('\n'));
    this.name = 'InputError';
  }
}
