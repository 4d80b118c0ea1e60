import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const recordCommand: Command = async (_argv, io) => {
  io.stderr('probebook: record is not built yet\n');
  return 1;
};
