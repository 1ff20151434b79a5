/** Every command of the CLI; a command module exports `register(program)`. Add new ones here. */
import type { Command } from 'commander';
import { register as errors } from './errors.ts';
import { register as build } from './build.ts';
import { register as demoData } from './demo-data.ts';
import { register as preview } from './preview.ts';
import { register as inspect } from './inspect.ts';
import { register as point } from './point-command.ts';
import { register as estimate } from './estimate-command.ts';
import { register as request } from './request-command.ts';

export const commands: Array<(program: Command) => void> = [errors, build, demoData, preview, inspect, point, estimate, request];
