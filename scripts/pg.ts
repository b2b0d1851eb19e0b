// The project's PostgreSQL cluster by hand: `tsx scripts/pg.ts start|stop|kill|crash|urls [DATABASE]`.
// `kill` stops it abruptly (`pg_ctl stop -m immediate`), `crash` sends the postmaster SIGKILL;
// fault tests use both, and so can a person.
import { crashCluster, ensureCluster, killCluster, stopCluster } from './lib/postgres.ts';

const [command, database = 'edgewise'] = process.argv.slice(2);
switch (command) {
  case 'start': {
    const c = ensureCluster((m) => console.error(`[edgewise] ${m}`));
    console.log(JSON.stringify({ port: c.port }));
    break;
  }
  case 'stop':
    console.log(stopCluster() ? 'stopped' : 'was not running');
    break;
  case 'kill':
    killCluster();
    console.log('killed');
    break;
  case 'crash':
    crashCluster();
    console.log('crashed');
    break;
  case 'urls': {
    const c = ensureCluster();
    console.log(
      JSON.stringify({ adminUrl: c.adminUrl(database), appUrl: c.appUrl(database), port: c.port }),
    );
    break;
  }
  default:
    console.error('usage: tsx scripts/pg.ts start|stop|kill|crash|urls [DATABASE]');
    process.exit(2);
}
