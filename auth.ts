import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { clientIp, recordSignInFailure, signInBlockedReason } from "@/lib/server/sign-in-limits";
import { consumeSignInLink } from "@/lib/server/sign-in-links";
import { verifyPassword } from "@/lib/server/users";

class RateLimited extends CredentialsSignin { code = "rate_limited"; }

export const { handlers, auth, signIn, signOut } = NextAuth({
  secret: env().authSecret,
  trustHost: true,
  useSecureCookies: env().secureCookies,
  session: { strategy: "jwt", maxAge: 14 * 24 * 3600 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    Credentials({
      id: "password",
      credentials: { email: { type: "email" }, password: { type: "password" } },
      async authorize(credentials, request) {
        const email = String(credentials?.email ?? "");
        const password = String(credentials?.password ?? "");
        const ip = clientIp(request.headers);
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
    jwt({ token, user }) {
      if (user?.id) token.uid = user.id;
      return token;
    },
    session({ session, token }) {
      if (token.uid) session.user.id = String(token.uid);
      return session;
    },
  },
});
