import { useEffect, useState } from 'react';

/** A value that may still be on its way: ready, still coming, or failed with a one-line reason. */
export type Settled<T> =
  | { readonly state: 'ready'; readonly value: T }
  | { readonly state: 'pending' }
  | { readonly state: 'failed'; readonly message: string };

const isThenable = <T>(v: T | PromiseLike<T>): v is PromiseLike<T> =>
  v !== null && (typeof v === 'object' || typeof v === 'function') && typeof (v as { then?: unknown }).then === 'function';

const pending = { state: 'pending' } as const;

/**
 * A value given either as it is or as a promise (the TUI loads its plans after
 * its first frame): a plain value is ready at once, with no extra render.
 */
export function useSettled<T>(source: T | PromiseLike<T>): Settled<T> {
  const [settled, setSettled] = useState<{ readonly of: PromiseLike<T>; readonly result: Settled<T> } | null>(null);
  useEffect(() => {
    if (!isThenable(source)) return;
    let isLive = true;
    source.then(
      (value) => isLive && setSettled({ of: source, result: { state: 'ready', value } }),
      (error: unknown) => isLive && setSettled({ of: source, result: { state: 'failed', message: error instanceof Error ? error.message : String(error) } }),
    );
    return () => {
      isLive = false;
    };
  }, [source]);
  if (!isThenable(source)) return { state: 'ready', value: source };
  return settled?.of === source ? settled.result : pending;
}
