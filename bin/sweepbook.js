#!/usr/bin/env node
// Installed command: runs the TypeScript command line through tsx's loader (a runtime dependency).
import { register } from 'tsx/esm/api';

register();
await import('../app/cli/entry.ts');
