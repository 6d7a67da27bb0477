import "server-only";
import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import { adjacencyGraphs, dictionary } from "@zxcvbn-ts/language-common";
import { AppError } from "./errors";

/**
 * Password policy, after NIST SP 800-63B §5.1.1.2: a minimum length (12 here, checked by the shared
 * schema in lib/validation/mail.ts), no composition rules, and a check against commonly used and
 * easily guessed passwords. The check is zxcvbn-ts with its common dictionaries (common passwords,
 * names, keyboard patterns, repeats, sequences) and the person's own details; a score under 3 ("safely
 * unguessable: moderate protection from offline slow-hash scenario", the library's scale) is refused.
 */
export const MIN_SCORE = 3;

let checker: ZxcvbnFactory | null = null;
const zxcvbn = () => (checker ??= new ZxcvbnFactory({ dictionary: { ...dictionary }, graphs: adjacencyGraphs }));

/** Why the password is too easy to guess, in plain words, or null when it is fine. */
export function passwordProblem(password: string, personal: string[] = []): string | null {
  const r = zxcvbn().check(password, personal.filter(Boolean).flatMap((s) => [s, ...s.toLowerCase().split(/[^a-z0-9]+/)]).filter((s) => s.length >= 3));
  if (r.score >= MIN_SCORE) return null;
  const why = r.feedback.warning === "userInputs" ? "it contains your name or e-mail address" : r.feedback.warning === "common" || r.feedback.warning === "similarToCommon" ? "it is one of the passwords people use most" : "it follows a pattern that is easy to guess";
  return `This password is too easy to guess: ${why}. A few unrelated words make a strong one.`;
}

/** Throws a 422 with a field error when the password is too easy to guess. */
export function assertPasswordStrong(password: string, personal: string[] = []): void {
  const problem = passwordProblem(password, personal);
  if (problem) throw new AppError("invalid", problem, { password: [problem] });
}
