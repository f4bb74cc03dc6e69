// commander loaded through require: its CommonJS build imported from ESM goes through Node's named-export scan of
// the source (about 10 ms of every start, measured with Node 20); required, it is only evaluated.
import { createRequire } from 'node:module';
import type * as CommanderModule from 'commander';

const commander = createRequire(import.meta.url)('commander') as typeof CommanderModule;

export const { Command, Option, CommanderError } = commander;
