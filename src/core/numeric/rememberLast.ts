/**
 * f with a memory of one call: called again with the same numbers (===, so NaN never matches) it returns its last
 * answer without calling f. For pure functions asked the same question many times in a row (one galaxy's Sérsic
 * index, one slit width and seeing for every slit of a mask); a throw is not remembered.
 */
export function rememberLast<A extends readonly number[], R>(f: (...args: A) => R): (...args: A) => R {
  let lastArgs: A | null = null;
  let lastAnswer: R;
  return (...args: A): R => {
    if (lastArgs !== null && sameNumbers(args, lastArgs)) return lastAnswer;
    const answer = f(...args);
    lastArgs = args;
    lastAnswer = answer;
    return answer;
  };
}

function sameNumbers(a: readonly number[], b: readonly number[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
