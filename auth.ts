import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { describeForLog } from "@/lib/http/redact";
import { clientAddress } from "@/lib/server/limits/client-address";
import { createSession, isSessionActive, revokeSession, SESSION_MAX_AGE_S } from "@/lib/server/sessions";
import { recordSignInFailure, signInBlockedReason } from "@/lib/server/sign-in-limits";
import { consumeSignInLink } from "@/lib/server/sign-in-links";
import { verifyPassword } from "@/lib/server/users";

class RateLimited extends CredentialsSignin {
  code = "rate_limited";
}

/** A submitted credential as text (a missing or non-text field is empty). */
const text = (v: unknown): string => (typeof v === "string" ? v : "");

export const { handlers, auth, signIn, signOut } = NextAuth({
  secret: env().authSecret,
  trustHost: true,
  // A wrong password is an answer, not a fault: only other errors are logged, with secrets redacted.
  logger: {
    error(error) {
      // By `type`, not `name`: the bundler renames classes. RateLimited inherits CredentialsSignin's type.
      if ((error as { type?: string }).type === "CredentialsSignin") return;
      console.error(`[auth] ${describeForLog(error)}`);
    },
  },
  useSecureCookies: env().secureCookies,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    Credentials({
      id: "password",
      credentials: { email: { type: "email" }, password: { type: "password" } },
      async authorize(credentials, request) {
        const email = text(credentials?.email);
        const password = text(credentials?.password);
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
      authorize: async (credentials) => consumeSignInLink(text(credentials?.token)),
    }),
  ],
  callbacks: {
    // The cookie names a server-side session row; once sign-out revokes it the cookie is worthless.
    async jwt({ token, user }) {
      if (user?.id) return { ...token, uid: user.id, sid: await createSession(user.id) };
      return (await isSessionActive(token.sid)) ? token : null;
    },
    session({ session, token }) {
      if (typeof token.uid === "string" && token.uid) session.user.id = token.uid;
      return session;
    },
  },
  events: {
    async signOut(message) {
      if ("token" in message) await revokeSession(message.token?.sid);
    },
  },
});
