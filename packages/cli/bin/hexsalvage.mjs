#!/usr/bin/env node
// Launcher: the compiled CLI lives in ../dist (run `pnpm build` first).
import { readFileSync } from 'node:fs';

const argv = process.argv.slice(2);
if (argv.length === 1 && (argv[0] === '--version' || argv[0] === '-v')) {
  // answered here, before the CLI's modules load: a version query should cost no more than
  // starting Node (main() gives the same answer for callers in process)
  const { version } = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8'));
  process.stdout.write(`hexsalvage ${version}\n`);
} else {
  const { main } = await import('../dist/main.js');
  const { stdoutClosed, stdoutSink } = await import('../dist/output/output.js');
  process.stderr.on('error', () => {});
  if (stdoutClosed()) {
    process.stderr.write('hexsalvage: standard output is closed: nothing this command prints could be read (redirect it to a file or to /dev/null)\n');
    process.exit(74);
  }
  const io = {
    stdout: stdoutSink(process.stdout),
    stderr: (text) => process.stderr.write(text),
    stderrIsTTY: process.stderr.isTTY === true,
  };
  // exitCode, not process.exit(): the process ends only after stdout has drained, even on a pipe.
  main(argv, io).then(
    (code) => {
      process.exitCode = code;
    },
    (err) => {
      process.stderr.write(`hexsalvage: internal error: ${String(err?.message ?? err).split('\n')[0]}\n`);
      process.exitCode = 70;
    },
  );
}
