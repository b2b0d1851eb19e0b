import { stopCluster } from './lib/postgres.ts';

console.log(
  stopCluster() ? '[edgewise] PostgreSQL stopped' : '[edgewise] PostgreSQL was not running',
);
