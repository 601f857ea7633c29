import type {} from "express-session";
import type { Role } from "../../contracts/common";

/** Who is calling: resolved per request from the session cookie or a Bearer token. */
export interface Principal {
  userId: number;
  email: string;
  name: string;
  teamId: number;
  teamName: string;
  role: Role;
  via: "session" | "token";
  tokenId: number | null;
}

declare global {
  namespace Express {
    interface Request {
      principal?: Principal;
    }
  }
}

declare module "express-session" {
  interface SessionData {
    userId: number;
    teamId: number;
    csrfToken: string;
  }
}
