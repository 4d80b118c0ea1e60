import { useCallback, useRef, useState } from 'react';

/**
 * State that a key handler can read at once. Keys typed quickly (or pasted)
 * can arrive before React has rendered the previous one, so a handler that
 * read its state from the last render would act on stale values; this keeps
 * the latest value in a ref, updated synchronously, and renders from it.
 */
export function useLiveState<T>(initial: T | (() => T)) {
  const [value, setValue] = useState(initial);
  const ref = useRef(value);
  const set = useCallback((next: T | ((previous: T) => T)) => {
    const resolved = typeof next === 'function' ? (next as (previous: T) => T)(ref.current) : next;
    if (Object.is(resolved, ref.current)) return;
    ref.current = resolved;
    setValue(resolved);
  }, []);
  return [value, set, ref] as const;
}
