/**
 * A Halfmark API server for the bench and the kill test: reads its configuration from the
 * environment (DATABASE_URL, SESSION_SECRET, PORT, HOST 127.0.0.1), serves, and prints
 * "LISTENING <url>" on stdout when ready. Run it with `node --import tsx` so that a signal sent
 * to the child's pid reaches the server itself.
 */
import { loadConfig } from '../../server/config';
import { listen } from '../../server/index';

const running = await listen(loadConfig({ HOST: '127.0.0.1', ...process.env }));
console.log(`LISTENING ${running.url}`);
const stop = () => {
  void running.close().finally(() => process.exit(0));
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
