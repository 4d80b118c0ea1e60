/** Pad or cut `text` to exactly `width` columns (cut text ends in `…`). */
export function cell(text: string, width: number, align: 'left' | 'right' = 'left'): string {
  if (width <= 0) return '';
  const chars = [...text];
  if (chars.length > width) return `${chars.slice(0, Math.max(0, width - 1)).join('')}…`;
  const pad = ' '.repeat(width - chars.length);
  return align === 'left' ? text + pad : pad + text;
}
