import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const targetsCommand: Command = async (_argv, io) => {
  io.stderr('probebook: targets is not built yet\n');
  return 1;
};
