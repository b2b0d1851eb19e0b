// `npm run stop`: stops the project's PostgreSQL cluster (the app and fakes stop with Ctrl-C).
import { ensureNodeModules, runTs } from './lib/bootstrap.mjs';

ensureNodeModules();
process.exit(runTs('scripts/stop-services.ts'));
