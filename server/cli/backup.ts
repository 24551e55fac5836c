import path from 'node:path';
import { createBackup } from '../ops/backup.js';
import { OpsError } from '../ops/backup-format.js';

// npm run backup -- <file.tar.gz>
// Online backup of DATA_DIR (default ./data): works while the server is running. DATA_DIR is read
// from the environment without loadConfig(), which would create folders and secrets as a side effect.
async function main(): Promise<void> {
  const file = process.argv[2];
  if (!file || process.argv.length > 3) throw new OpsError('Usage: npm run backup -- <backup-file.tar.gz>   (DATA_DIR from the environment, default ./data)');
  const dataDir = path.resolve(process.env['DATA_DIR'] || './data');
  const started = Date.now();
  const { file: out, manifest } = await createBackup(dataDir, file, (phase, done, total) => {
    if (done === total) console.log(`  ${phase}: done (${total})`);
  });
  const rows = Object.values(manifest.tables).reduce((a, b) => a + b, 0);
  console.log(
    `Backup written to ${out}: database ${manifest.database.bytes} bytes (${rows} rows in ${Object.keys(manifest.tables).length} tables, ` +
      `migration ${manifest.migrations.latest}), ${manifest.attachments.length} attachment file(s), ${((Date.now() - started) / 1000).toFixed(1)} s.`,
  );
}

main().catch((err: unknown) => {
  console.error(err instanceof OpsError ? `Backup refused: ${err.message}` : err);
  process.exit(err instanceof OpsError ? 2 : 1);
});
