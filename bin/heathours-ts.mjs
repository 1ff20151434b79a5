#!/usr/bin/env node
// The `heathours` command run from the TypeScript sources (transpiled by tsx as they load, about
// 2 s to start), for development and for the tests that run the command as a process. The shipped
// command is bin/heathours.mjs, which runs the compiled JavaScript.
import '../pipeline/infra/ts-boot.mjs';

const { main } = await import('../pipeline/cli.ts');
await main(process.argv);
