import { createInterface } from 'node:readline/promises';
import { parseArgs } from 'node:util';
import { email as emailSchema, newPassword } from '../../shared/auth.js';
import { loadConfig } from '../config.js';
import { createContext } from '../bootstrap.js';
import { createUser } from '../services/users.js';

// npm run create-admin -- --email you@lab.example --name "Your Name"
// The password is read from ADMIN_PASSWORD or asked for on the terminal (never a command-line argument,
// which would end up in shell history).
async function main(): Promise<void> {
  const { values } = parseArgs({ options: { email: { type: 'string' }, name: { type: 'string' } } });
  const email = emailSchema.parse(values.email ?? '');
  const name = (values.name ?? '').trim() || email;
  let password = process.env['ADMIN_PASSWORD'];
  if (!password) {
    const rl = createInterface({ input: process.stdin, output: process.stdout });
    password = await rl.question('Password for the new administrator (12+ characters): ');
    rl.close();
  }
  newPassword.parse(password);
  const running = await createContext({ ...loadConfig(), demo: false, smtp: { host: '127.0.0.1', port: 1, secure: false } });
  try {
    const user = await createUser(running.ctx, { email, name, role: 'admin', password });
    console.log(`Administrator ${user.email} created (id ${user.id}).`);
  } finally {
    await running.close();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : String(err));
  process.exit(2);
});
