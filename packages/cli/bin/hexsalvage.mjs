#!/usr/bin/env node
// Launcher: the compiled CLI lives in ../dist (run `pnpm build` first).
import { main } from '../dist/main.js';
import { stdoutSink } from '../dist/output.js';

process.stderr.on('error', () => {});
const io = {
  stdout: stdoutSink(process.stdout),
  stderr: (text) => process.stderr.write(text),
  stderrIsTTY: process.stderr.isTTY === true,
};

// exitCode, not process.exit(): the process ends only after stdout has drained, even on a pipe.
main(process.argv.slice(2), io).then(
  (code) => { process.exitCode = code; },
  (err) => { process.stderr.write(`hexsalvage: internal error: ${String(err?.message ?? err).split('\n')[0]}\n`); process.exitCode = 70; },
);
