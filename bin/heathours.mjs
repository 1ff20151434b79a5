#!/usr/bin/env node
// Entry point of the `heathours` command. Node 20 cannot run TypeScript directly, so the
// TypeScript sources are loaded through tsx's ESM loader (a runtime dependency).
import '../pipeline/model/preload-native.mjs';
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../pipeline/cli.ts');
await main(process.argv);
