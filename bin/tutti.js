#!/usr/bin/env node
// The `tutti` command: Node 20 cannot run TypeScript itself, so tsx loads the sources.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

// The project's tsconfig.json (its `@shared/*` path alias) whatever folder the command runs from.
register({ tsconfig: fileURLToPath(new URL('../tsconfig.json', import.meta.url)) });
const { main } = await import('../server/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
