/**
 * auth-astro configuration: e-mail + password (Credentials) with JWT sessions. The person's id and role go
 * on the token; depot scope is loaded fresh from the database on every request by the middleware, so that a
 * change of role or depots takes effect at once. Edit when adding a sign-in method.
 */
import Credentials from '@auth/core/providers/credentials';
import { defineConfig } from 'auth-astro';
import { checkCredentials } from './src/server/sign-in';
import { ensureAuthSecret } from './src/env';

export default defineConfig({
  // NOTE: read at run time, not import.meta.env (fixed at build time) — STACK.md gotcha 1.
  secret: ensureAuthSecret(),
  trustHost: true,
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        const r = await checkCredentials(credentials?.email, credentials?.password);
        if (!r.ok) return null;
        return { id: String(r.user.id), email: r.user.email, name: r.user.name, role: r.user.role };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role;
      }
      return token;
    },
    session({ session, token }) {
      if (session.user && token.uid) {
        session.user.id = String(token.uid);
        session.user.role = token.role;
      }
      return session;
    },
  },
});
