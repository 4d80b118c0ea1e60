/** Where a command writes; injected so tests can capture it. */
export interface CommandIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly env: NodeJS.ProcessEnv;
  readonly cwd: string;
}

/** A non-interactive command: returns its exit status (0 done, 2 bad input, 1 anything else). */
export type Command = (argv: readonly string[], io: CommandIo) => Promise<number>;
