import { AppError, ERRORS } from "./errors";

/** Cursors are opaque to clients: the last id of the previous page, base64url-encoded. */
export function encodeCursor(id: number): string {
  return Buffer.from(`id:${id}`, "utf8").toString("base64url");
}

export function decodeCursor(cursor: string | undefined): number | null {
  if (cursor === undefined || cursor === "") return null;
  const match = /^id:(\d+)$/.exec(Buffer.from(cursor, "base64url").toString("utf8"));
  if (!match) throw new AppError(ERRORS.validationFailed, { message: "The cursor is not valid.", details: { field: "cursor" } });
  return Number(match[1]);
}
