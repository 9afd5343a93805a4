#!/usr/bin/env node
// The `tutti` command: Node 20 cannot run TypeScript itself, so tsx loads the sources.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../server/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
