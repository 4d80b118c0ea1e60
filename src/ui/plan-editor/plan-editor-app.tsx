import { useApp } from 'ink';
import type { Draft } from '../../plan/draft.js';
import { useTerminalSize } from '../components/use-terminal-size.js';
import { PlanEditor } from './plan-editor.js';

export interface PlanEditorAppProps {
  readonly file: string;
  readonly initial: Draft;
  readonly savedText: string | null;
  readonly save: (text: string) => void;
}

/** `probebook plan new FILE` on its own: the editor at the terminal's size, following resizes; leaving ends the program. */
export function PlanEditorApp(props: PlanEditorAppProps) {
  const app = useApp();
  const { width, height } = useTerminalSize();
  return <PlanEditor {...props} width={width} height={height} onExit={() => app.exit()} />;
}
