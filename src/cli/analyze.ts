import type { Command } from './command.js';

// PLACEHOLDER until the command is written.
export const analyzeCommand: Command = async (_argv, io) => {
  io.stderr('probebook: analyze is not built yet\n');
  return 1;
};
