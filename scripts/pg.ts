// The project's PostgreSQL cluster by hand: `tsx scripts/pg.ts start|stop|kill|urls [DATABASE]`.
// `kill` stops it abruptly (as a crash would); fault tests use it, and so can a person.
import { ensureCluster, killCluster, stopCluster } from './lib/postgres.ts';

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
  case 'urls': {
    const c = ensureCluster();
    console.log(
      JSON.stringify({ adminUrl: c.adminUrl(database), appUrl: c.appUrl(database), port: c.port }),
    );
    break;
  }
  default:
    console.error('usage: tsx scripts/pg.ts start|stop|kill|urls [DATABASE]');
    process.exit(2);
}
