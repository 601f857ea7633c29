import { PreferencesSchema, UpdateMeSchema } from "../../../contracts/preferences";
import { defineRoute } from "../../http/route";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { findNotify, setNotify } from "./preferences.repo";

export const preferencesRoutes = [
  defineRoute({
    method: "get",
    path: "/api/auth/me/preferences",
    access: "viewer",
    tag: "auth",
    summary: "Your own settings (run e-mails on or off)",
    response: PreferencesSchema,
    handler: async ({ deps, principal }) => ({ notify: await findNotify(deps.db, principal.userId) }),
  }),
  defineRoute({
    method: "patch",
    path: "/api/auth/me",
    access: "viewer",
    tag: "auth",
    summary: "Change your own settings: `notify: false` stops every run e-mail to you",
    body: UpdateMeSchema,
    response: PreferencesSchema,
    audit: "by-service",
    handler: async ({ deps, principal, body, ip }) => {
      await setNotify(deps.db, principal.userId, body.notify);
      await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: body.notify ? "user.notify-on" : "user.notify-off", target: principal.email });
      return { notify: body.notify };
    },
  }),
];
