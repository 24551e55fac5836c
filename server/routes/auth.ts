import { Router, type Request } from 'express';
import type passport from 'passport';
import { changePasswordBody, loginBody, resetConfirmBody, resetRequestBody } from '../../shared/auth.js';
import type { AppContext } from '../context.js';
import { HttpError } from '../http-error.js';
import { renewCsrfToken } from '../auth/csrf.js';
import { loginLimits } from '../auth/login-limits.js';
import { publicRoute, signedIn } from '../auth/policy.js';
import { confirmReset, requestReset } from '../services/password-reset.js';
import { changePassword } from '../services/users.js';
import { sessionOnly } from '../services/tokens.js';
import { audit } from '../services/audit.js';

export function requestOrigin(req: Request): string {
  return `${req.protocol}://${req.get('host')}`;
}

export function authRouter(ctx: AppContext, pp: passport.PassportStatic): Router {
  const r = Router();

  r.post('/auth/login', publicRoute(), ...loginLimits(ctx.config), (req, res, next) => {
    const body = loginBody.parse(req.body);
    req.body = body;
    pp.authenticate('local', (err: unknown, user: Express.User | false, info?: { message?: string }) => {
      if (err) return next(err);
      if (!user) return next(new HttpError(401, info?.message ?? 'E-mail or password is not correct'));
      // A fresh session id on sign-in defeats session fixation; the old id is destroyed.
      req.session.regenerate((regenErr) => {
        if (regenErr) return next(regenErr);
        req.login(user, { session: true, keepSessionInfo: false }, (loginErr) => {
          if (loginErr) return next(loginErr);
          renewCsrfToken(req, res);
          audit(ctx.db, { userId: user.id, entity: 'user', entityId: String(user.id), action: 'sign-in' });
          res.json({ user });
        });
      });
    })(req, res, next);
  });

  r.post('/auth/logout', publicRoute(), (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        // The XSRF token belonged to the destroyed session: clear it so the next sign-in gets a fresh one.
        res.clearCookie('specimetry.sid');
        res.clearCookie('XSRF-TOKEN');
        res.status(204).end();
      });
    });
  });

  r.get('/me', signedIn(), (req, res) => {
    res.json({ user: req.user, viaToken: Boolean(req.authViaToken) });
  });

  r.post('/auth/password-reset', publicRoute(), ...loginLimits(ctx.config).slice(0, 1), async (req, res) => {
    const { email } = resetRequestBody.parse(req.body);
    await requestReset(ctx, email, requestOrigin(req));
    res.status(202).json({ message: 'If an active account uses this address, a reset link is on its way.' });
  });

  r.post('/auth/password-reset/confirm', publicRoute(), async (req, res) => {
    const { token, password } = resetConfirmBody.parse(req.body);
    await confirmReset(ctx, token, password);
    res.status(204).end();
  });

  // Session only: a leaked API token must not be able to take over the account.
  r.post('/account/password', signedIn({ scope: 'write' }), sessionOnly, async (req, res) => {
    const body = changePasswordBody.parse(req.body);
    await changePassword(ctx, req.user!.id, body.currentPassword, body.newPassword);
    res.status(204).end();
  });

  return r;
}
