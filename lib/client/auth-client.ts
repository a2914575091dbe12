import { createAuthClient } from "better-auth/react";

// No baseURL: in the browser the client talks to /api/auth on the page's own origin.
export const authClient = createAuthClient();
