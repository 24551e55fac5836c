import path from 'node:path';
import { restoreBackup } from '../ops/restore.js';
import { OpsError } from '../ops/backup-format.js';

// npm run restore -- <file.tar.gz>
// Restores into DATA_DIR (default ./data), which must be empty or not exist yet. Start the server
// afterwards: pending migrations of a newer Specimetry are applied at start-up as usual.
async function main(): Promise<void> {
  const file = process.argv[2];
  if (!file || process.argv.length > 3) throw new OpsError('Usage: npm run restore -- <backup-file.tar.gz>   (into an empty DATA_DIR, default ./data)');
  const dataDir = path.resolve(process.env['DATA_DIR'] || './data');
  const manifest = await restoreBackup(file, dataDir, (phase, done, total) => {
    if (done === total) console.log(`  ${phase}: done (${total})`);
  });
  console.log(
    `Restored the backup of ${manifest.createdAt} (Specimetry ${manifest.appVersion}, migration ${manifest.migrations.latest}) into ${dataDir}: ` +
      `database checked (integrity ok, row counts match), ${manifest.attachments.length} attachment file(s) verified. Everybody signs in again.`,
  );
}

main().catch((err: unknown) => {
  console.error(err instanceof OpsError ? `Restore refused: ${err.message}` : err);
  process.exit(err instanceof OpsError ? 2 : 1);
});
