import type { Command } from './command.js';

// PLACEHOLDER until the batch report is written.
export const reportBatchCommand: Command = async (_argv, io) => {
  io.stderr('probebook: report --batch is not built yet\n');
  return 1;
};
