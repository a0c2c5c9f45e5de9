import type { Request } from 'express';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { loadAuthUser, verifyCredentials, type SessionUser } from './auth.service';

/** What a signed-in session stores: the user id and the user's session generation at sign-in. */
interface SessionRef {
  id: number;
  gen: number;
}

/**
 * passport-local against our users; the session holds only the user id and session generation, and the
 * user is reloaded on each request. A session whose generation is no longer the user's (the password was
 * changed or reset since) is signed out.
 */
export function configurePassport(): typeof passport {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      verifyCredentials(email, password).then(
        (user) => done(null, user),
        (err) => done(err),
      );
    }),
  );
  passport.serializeUser((user, done) => {
    const u = user as SessionUser;
    done(null, { id: u.id, gen: u.sessionGeneration } satisfies SessionRef);
  });
  passport.deserializeUser((ref: unknown, done) => {
    const r = ref as Partial<SessionRef> | null;
    const id = Number(r?.id);
    const gen = Number(r?.gen);
    if (!Number.isSafeInteger(id) || !Number.isSafeInteger(gen)) return done(null, false);
    loadAuthUser(id, gen).then(
      (user) => done(null, user ?? false),
      (err) => done(err),
    );
  });
  return passport;
}

/**
 * Keeps the caller's own session signed in after its user's session generation moved on (own password
 * change, or an administrator resetting their own password): signs the session in again with the current
 * generation. The session id is renewed; its other contents (the CSRF token) are kept.
 */
export async function keepSessionSignedIn(req: Request, userId: number): Promise<void> {
  const user = await loadAuthUser(userId);
  if (!user) return;
  await new Promise<void>((resolve, reject) => req.logIn(user, { session: true, keepSessionInfo: true }, (err) => (err ? reject(err) : resolve())));
}
