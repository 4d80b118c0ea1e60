import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const reportCommand: Command = async (_argv, io) => {
  io.stderr('probebook: report is not built yet\n');
  return 1;
};
