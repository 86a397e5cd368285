// Guards for values the code knows are there (an index inside its list's bounds, a key it just set)
// but that the type checker, with `noUncheckedIndexedAccess`, cannot prove. A miss is a bug, so it
// throws with a message that says what was missing — never a silent default.

/** `list[index]`, where the index is known to be in range; throws naming `what` if it is not. */
export function at<T>(list: ArrayLike<T>, index: number, what = 'item'): T {
  const value = list[index];
  if (value === undefined) throw new Error(`${what} ${index} is missing (list of ${list.length})`);
  return value;
}

/** `value`, known to be present; throws naming `what` if it is undefined or null. */
export function defined<T>(value: T | null | undefined, what: string): T {
  if (value === undefined || value === null) throw new Error(`${what} is missing`);
  return value;
}
