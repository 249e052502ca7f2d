import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { clientAddress } from "@/lib/server/limits/client-address";
import { createSession, isSessionActive, revokeSession, SESSION_MAX_AGE_S } from "@/lib/server/sessions";
import { recordSignInFailure, signInBlockedReason } from "@/lib/server/sign-in-limits";
import { consumeSignInLink } from "@/lib/server/sign-in-links";
import { verifyPassword } from "@/lib/server/users";

class RateLimited extends CredentialsSignin { code = "rate_limited"; }

export const { handlers, auth, signIn, signOut } = NextAuth({
  secret: env().authSecret,
  trustHost: true,
  useSecureCookies: env().secureCookies,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    Credentials({
      id: "password",
      credentials: { email: { type: "email" }, password: { type: "password" } },
      async authorize(credentials, request) {
        const email = String(credentials?.email ?? "");
        const password = String(credentials?.password ?? "");
        const ip = clientAddress(request.headers);
        if (await signInBlockedReason(email, ip)) throw new RateLimited();
        const user = await verifyPassword(email, password);
        if (!user) await recordSignInFailure(email, ip);
        return user;
      },
    }),
    Credentials({
      id: "email-link",
      credentials: { token: { type: "text" } },
      authorize: async (credentials) => consumeSignInLink(String(credentials?.token ?? "")),
    }),
  ],
  callbacks: {
    // The cookie names a server-side session row; once sign-out revokes it the cookie is worthless.
    async jwt({ token, user }) {
      if (user?.id) return { ...token, uid: user.id, sid: await createSession(user.id) };
      return (await isSessionActive(token.sid)) ? token : null;
    },
    session({ session, token }) {
      if (token.uid) session.user.id = String(token.uid);
      return session;
    },
  },
  events: {
    async signOut(message) {
      if ("token" in message) await revokeSession(message.token?.sid);
    },
  },
});
