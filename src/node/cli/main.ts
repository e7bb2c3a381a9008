#!/usr/bin/env node
/**
 * The `meniscus` program: runs {@link runCli} on the process's arguments and exits
 * with its code.
 *
 * @module
 */
import { runCli } from './run.js';

void runCli(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
