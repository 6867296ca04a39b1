/**
 * next-auth options: a credentials provider (e-mail + password, checked with scrypt in
 * lib/accounts/passwords.ts) and JWT sessions. The JWT carries the user id and role; every
 * request re-reads the user from the database (lib/session.ts, lib/http/context.ts), so a
 * deleted account loses access at once.
 */
import NextAuth, { type NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { authenticate } from "@/lib/accounts/users";
import { clientAddress, limits, tooManyRequests } from "@/lib/http/rate-limit";

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(credentials) {
        const email = typeof credentials?.email === "string" ? credentials.email : "";
        const password = typeof credentials?.password === "string" ? credentials.password : "";
        if (!email || !password || email.includes("\u0000")) return null;
        const user = await authenticate(email, password);
        return user ? { id: user.id, email: user.email, name: user.name, role: user.role } : null;
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.role = (user as { role?: string }).role;
      }
      return token;
    },
    session({ session, token }) {
      return { ...session, user: { ...session.user, id: token.sub, role: token.role } };
    },
  },
};

const nextAuthHandler = NextAuth(authOptions) as (req: Request, ctx: unknown) => Promise<Response>;

/**
 * The next-auth route handler (re-exported by app/api/auth/[...nextauth]/route.ts), with sign-in
 * attempts rate-limited (lib/http/rate-limit.ts): per address and e-mail, and per e-mail from
 * anywhere. Over the limit, the attempt is refused with 429 problem+json and Retry-After before
 * the password is checked.
 */
export async function handler(req: Request, ctx: unknown): Promise<Response> {
  if (req.method === "POST" && new URL(req.url).pathname.endsWith("/callback/credentials")) {
    const form = await req
      .clone()
      .formData()
      .catch(() => null);
    const raw = form?.get("email");
    // NUL cannot be stored in PostgreSQL text (lib/validation/nul.ts); such an e-mail matches no account anyway.
    const email = typeof raw === "string" ? raw.trim().toLowerCase().slice(0, 200).replaceAll("\u0000", "") : "";
    const wait = (await limits.signInAddress.hit(`${clientAddress(req)} ${email}`)) ?? (await limits.signInAccount.hit(email));
    if (wait !== null) return tooManyRequests(wait, new URL(req.url).pathname, "Too many sign-in attempts.");
  }
  return nextAuthHandler(req, ctx);
}
