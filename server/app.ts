import express, { Router, type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { pinoHttp } from 'pino-http';
import type { AppContext } from './context.js';
import { bearerAuth } from './auth/bearer.js';
import { tokenUseAudit } from './services/tokens.js';
import { csrfProtection, parseCookies } from './auth/csrf.js';
import { configurePassport } from './auth/passport.js';
import { apiNotFound, errorHandler } from './middleware/errors.js';
import { authRouter } from './routes/auth.js';
import { systemRouter } from './routes/system.js';
import { usersRouter } from './routes/users.js';
import { extraRouters } from './routes/index.js';

export const CLIENT_DIR = path.resolve(import.meta.dirname, '../dist/specimetry/browser');
export const SESSION_COOKIE = 'specimetry.sid';

/**
 * Builds the Express app (exported for supertest). Order matters: security headers and logging,
 * body parsing, session + passport, bearer tokens, CSRF, then the API, then the built client.
 */
export function createApp(ctx: AppContext): { app: Express; api: Router } {
  const app = express();
  app.disable('x-powered-by');
  if (ctx.config.trustProxy) app.set('trust proxy', 1);

  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Angular component styles and echarts' element styles are inline; scripts stay 'self' only.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          upgradeInsecureRequests: null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use(
    pinoHttp({
      logger: ctx.log,
      genReqId: (req, res) => {
        const incoming = req.headers['x-request-id'];
        const id = typeof incoming === 'string' && /^[\w-]{1,64}$/.test(incoming) ? incoming : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    }),
  );

  const api = Router();
  api.use(express.json({ limit: '10mb' }));
  api.use(parseCookies);
  api.use(
    session({
      name: SESSION_COOKIE,
      secret: ctx.config.sessionSecret,
      store: ctx.sessionStore,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: 12 * 60 * 60 * 1000 },
    }),
  );
  const pp = configurePassport(ctx);
  api.use(pp.initialize());
  api.use(bearerAuth(ctx));
  api.use(tokenUseAudit(ctx));
  const sessionUser = pp.session(); // built once: pp.session() makes a new middleware on every call
  api.use((req, res, next) => (req.authViaToken ? next() : sessionUser(req, res, next)));
  api.use(csrfProtection);
  api.use(systemRouter(ctx));
  api.use(authRouter(ctx, pp));
  api.use(usersRouter(ctx));
  for (const router of extraRouters(ctx)) api.use(router);
  api.use(apiNotFound);
  app.use('/api', api);
  app.use('/api', errorHandler);

  serveClient(app);
  app.use(errorHandler);
  return { app, api };
}

function serveClient(app: Express): void {
  const index = path.join(CLIENT_DIR, 'index.html');
  app.use(express.static(CLIENT_DIR, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (_req, res) => {
    if (existsSync(index)) {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(index);
    } else {
      res.status(503).type('text').send('The client is not built yet. Run `npm run build` (npm start does this for you).');
    }
  });
}
