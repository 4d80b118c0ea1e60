import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const batchCommand: Command = async (_argv, io) => {
  io.stderr('probebook: batch is not built yet\n');
  return 1;
};
