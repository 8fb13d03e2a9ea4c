#!/usr/bin/env node
// The `horologium` executable: the command line with the real process streams, environment and clock.
import { runCli } from "./main.js";

runCli(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  stderrIsTty: Boolean(process.stderr.isTTY),
  env: process.env,
  cwd: process.cwd(),
  now: () => Date.now(),
}).then((code) => {
  process.exitCode = code;
});
