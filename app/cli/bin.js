#!/usr/bin/env node
// The installed `waymark` command: runs the TypeScript command line through tsx.
import { register } from 'tsx/esm/api';

register();
await import('./main.ts');
