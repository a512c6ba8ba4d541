#!/usr/bin/env node
import { main } from './main.js';
import { processIo } from './cli-io.js';
import { installInterruptHandlers } from './interrupts.js';

installInterruptHandlers(processIo);
process.exitCode = await main(process.argv.slice(2));
