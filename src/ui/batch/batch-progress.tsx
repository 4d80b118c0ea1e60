import { Box, Text } from 'ink';
import { useEffect, useRef, useState } from 'react';
import { toneProps } from '../theme.js';
import type { BatchState } from './use-batch-state.js';

/** The one warning line over the figures: that some checks are shown without bands, and why (the first reason); said first, so a narrow terminal keeps it. */
export function problemLine(problems: readonly { readonly message: string }[]): string {
  const first = problems[0]?.message ?? '';
  if (problems.length === 1) return `without bands: ${first}`;
  return `${problems.length} plan revisions without bands; first: ${first}`;
}

/** Whole seconds since `what` last changed, counted once a second while `isOn` (the worst case runs before any percent moves). */
function useSecondsOn(what: string, isOn: boolean): number {
  const since = useRef({ what, at: Date.now() });
  if (since.current.what !== what) since.current = { what, at: Date.now() };
  const [, tick] = useState(0);
  useEffect(() => {
    if (!isOn) return;
    const timer = setInterval(() => tick((n) => n + 1), 1000);
    return () => clearInterval(timer);
  }, [isOn]);
  return Math.floor((Date.now() - since.current.at) / 1000);
}

/** The line while the index is read, the targets computed or the boards scanned, and what keys work meanwhile. */
export function BatchProgress({ state }: { readonly state: BatchState }) {
  const p = state.progress;
  const seconds = useSecondsOn(p?.what ?? '', p?.isPercent ?? false);
  let line: string;
  if (p?.isPercent) line = `${p.what}… ${Math.min(100, Math.round((100 * p.done) / Math.max(1, p.total)))} %${seconds > 0 ? ` · ${seconds} s` : ''}`;
  else if (p) line = `${p.what}: ${p.done} of ${p.total}…`;
  else line = state.status === 'loading' ? 'Reading the index…' : 'Scanning boards…';
  return (
    <Box flexDirection="column">
      <Text wrap="truncate-end">{line}</Text>
      {p?.isPercent ? (
        <Text {...toneProps('dim')} wrap="wrap">
          The worst case first, then the Monte Carlo (the percent), once per plan revision; then kept in the targets cache. Esc leaves (the computation goes on
          and is kept) · ? help
        </Text>
      ) : null}
    </Box>
  );
}
