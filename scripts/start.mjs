// `npm start`: install what is missing, then hand over to scripts/serve.ts.
import {
  ensureNodeModules,
  ensureDebianPackages,
  SERVER_PACKAGES,
  runTs,
} from './lib/bootstrap.mjs';

ensureDebianPackages(SERVER_PACKAGES);
ensureNodeModules();
process.exit(runTs('scripts/serve.ts', process.argv.slice(2)));
