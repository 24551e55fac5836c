import type { AddressInfo } from 'node:net';
import { ConfigError, loadConfig } from './config.js';
import { createApp } from './app.js';
import { createContext } from './bootstrap.js';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from './services/seed.js';

async function main(): Promise<void> {
  const config = loadConfig();
  const running = await createContext(config);
  const { ctx } = running;
  const { app } = createApp(ctx);
  const server = app.listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  ctx.log.info({ port, dataDir: config.dataDir, version: ctx.version }, `Specimetry listening on http://localhost:${port}`);
  if (config.demo) {
    ctx.log.warn(
      { accounts: DEMO_ACCOUNTS.map((a) => a.email), password: DEMO_PASSWORD },
      `DEMO accounts are active (password "${DEMO_PASSWORD}"): for demonstration only — start with DEMO=0 for real use`,
    );
  } else {
    ctx.log.info('No demo accounts. Create the first administrator with: npm run create-admin -- --email you@lab.example --name "Your Name"');
  }
  if (running.fakeSmtp) ctx.log.info({ smtpPort: running.fakeSmtp.port }, 'built-in test mail server active; admins read mail on the Mail outbox page');

  // Graceful shutdown: stop accepting, let in-flight requests finish (10 s cap), then close the database.
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    ctx.log.info({ signal }, 'shutting down');
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    server.close(() => {
      running.close().then(
        () => process.exit(0),
        () => process.exit(1),
      );
    });
    server.closeIdleConnections();
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

main().catch((err: unknown) => {
  if (err instanceof ConfigError) {
    console.error(err.message);
  } else {
    console.error('Specimetry failed to start:', err);
  }
  process.exit(1);
});
