#!/usr/bin/env node
// Entry point of the command-line tool: runs the TypeScript sources through tsx's loader.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv);
