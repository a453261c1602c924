import { withAuth } from "next-auth/middleware";

// Sends the signed-out to the sign-in page before any app page renders. Every page, route handler
// and action still checks the session itself: this is a convenience, not the security boundary.
export default withAuth({ pages: { signIn: "/sign-in" } });

export const config = {
  matcher: ["/((?!api/|_next/|sign-in|invitation/|favicon.svg|robots.txt).*)"],
};
