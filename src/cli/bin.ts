import { startMark } from './start-marks.js';
import { main } from './main.js';

// The entry point of the bundled `probebook` command.
startMark('entry');
const status = await main(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  env: process.env,
  cwd: process.cwd(),
});
process.exitCode = status;
