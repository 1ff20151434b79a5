/** Every command of the CLI; a command module exports `register(program)`. Add new ones here. */
import type { Command } from 'commander';
import { register as errors } from './errors.ts';
import { register as preview } from './preview.ts';

export const commands: Array<(program: Command) => void> = [errors, preview];
