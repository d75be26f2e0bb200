#!/usr/bin/env node
// Launcher for package.json "bin": loads tsx from this project (whatever the working folder) and
// runs the TypeScript command line beside this file.
import { register } from 'tsx/esm/api';

register();
await import('./whorlwind-groom.ts');
