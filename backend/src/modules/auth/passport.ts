import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { loadAuthUser, verifyCredentials } from './auth.service';

/** passport-local against our users; the session holds only the user id, reloaded on each request. */
export function configurePassport(): typeof passport {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      verifyCredentials(email, password).then(
        (user) => done(null, user),
        (err) => done(err),
      );
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as Express.User).id));
  passport.deserializeUser((id: number, done) => {
    loadAuthUser(Number(id)).then(
      (user) => done(null, user ?? false),
      (err) => done(err),
    );
  });
  return passport;
}
