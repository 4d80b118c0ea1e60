import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const historyCommand: Command = async (_argv, io) => {
  io.stderr('probebook: history is not built yet\n');
  return 1;
};
