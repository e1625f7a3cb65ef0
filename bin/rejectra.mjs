#!/usr/bin/env node
// Installed entry point: runs the TypeScript CLI through tsx's loader.
import { register } from 'tsx/esm/api';
import { fileURLToPath } from 'node:url';

register();
await import(fileURLToPath(new URL('../cli/main.ts', import.meta.url)));
