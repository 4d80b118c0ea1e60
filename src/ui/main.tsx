import type { Command } from '../cli/command.js';

// PLACEHOLDER until the bench screen is written.
export const tuiCommand: Command = async (_argv, io) => {
  io.stderr('probebook: the bench screen is not built yet\n');
  return 1;
};
