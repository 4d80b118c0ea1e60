import { useEffect, useState } from 'react';
import { useStdout } from 'ink';

export interface Size {
  readonly width: number;
  readonly height: number;
}

/**
 * The terminal's size, updated on resize; `fixed` overrides it (tests, benchmarks).
 * The height is one row short of the terminal: Ink clears and redraws the whole
 * screen on every frame whose height reaches the terminal's, which flickers.
 */
export function useTerminalSize(fixed?: Partial<Size>): Size {
  const { stdout } = useStdout();
  const read = (): Size => ({
    width: fixed?.width ?? Math.max(40, stdout.columns || 80),
    height: fixed?.height ?? Math.max(10, (stdout.rows || 24) - 1),
  });
  const [size, setSize] = useState(read);
  useEffect(() => {
    const onResize = () => setSize(read());
    stdout.on('resize', onResize);
    return () => {
      stdout.off('resize', onResize);
    };
  }, [stdout, fixed?.width, fixed?.height]);
  return fixed?.width !== undefined && fixed.height !== undefined ? { width: fixed.width, height: fixed.height } : size;
}
