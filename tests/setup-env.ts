// Gives each integration test file the same configuration as the server under test, so
// services can also be called directly.
import { inject } from 'vitest';

Object.assign(process.env, inject('appEnv'));
