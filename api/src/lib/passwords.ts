import { hash, verify } from "@node-rs/argon2";
import { AppError, ERRORS } from "./errors";

export const MIN_PASSWORD_LENGTH = 10;

/** Returns the policy violations of a password; an empty list means acceptable. */
export function passwordProblems(password: string, email: string): string[] {
  const problems: string[] = [];
  if ([...password].length < MIN_PASSWORD_LENGTH) problems.push(`Use at least ${MIN_PASSWORD_LENGTH} characters.`);
  const lowered = password.trim().toLowerCase();
  const address = email.trim().toLowerCase();
  if (lowered === address || lowered === address.split("@")[0]) problems.push("Do not use your e-mail address.");
  return problems;
}

export function assertPasswordPolicy(password: string, email: string): void {
  const problems = passwordProblems(password, email);
  if (problems.length > 0) {
    throw new AppError(ERRORS.weakPassword, {
      message: `The password does not meet the policy. ${problems.join(" ")}`,
      details: { problems },
    });
  }
}

export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}
