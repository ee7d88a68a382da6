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

/** Longest part (where, what, fix) of a problem's line; longer text is cut, so a huge bad value is never echoed whole. */
export const MAX_PROBLEM_PART_CHARS = 400;

/** `text` cut to `max` characters with a note of its length. */
export function truncateText(text: string, max = MAX_PROBLEM_PART_CHARS): string {
  const oneLine = text.replace(/[\r\n]+/g, ' ');
  return oneLine.length <= max ? oneLine : `${oneLine.slice(0, max)}... (${oneLine.length - max} more characters)`;
}

/** One line of text for a problem: "where: what (fix)", each part cut to MAX_PROBLEM_PART_CHARS. */
export function formatProblem(p: Problem): string {
  return `${truncateText(p.where)}: ${truncateText(p.what)}${p.fix ? ` (${truncateText(p.fix)})` : ''}`;
}

/** Thrown by loaders when input is unusable; carries every problem found, not just the first. */
export class InputError extends Error {
  constructor(public readonly problems: Problem[]) {
    super(problems.map(formatProblem).join('\n'));
    this.name = 'InputError';
  }
}
