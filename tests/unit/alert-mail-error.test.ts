// Why an e-mail did not go, as the outbox keeps it: one plain sentence, no stack trace.
// The error shapes are nodemailer's (code ESOCKET with the system's originalCode; an SMTP
// refusal with responseCode and response), as seen from nodemailer 10 against a closed port.
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { plainMailError, refusedThisMessage } from "@/lib/server/alerts/mail-error";

const wrapped = (cause: object) => {
  const e = new AppError("unavailable", "The e-mail could not be sent just now; nothing was changed. Please try again.");
  e.cause = Object.assign(new Error("x\n    at somewhere (file.js:1:1)"), cause);
  return e;
};

describe("plain mail errors", () => {
  it("say what went wrong in a sentence", () => {
    expect(plainMailError(wrapped({ code: "ESOCKET", originalCode: "ECONNREFUSED" }))).toBe("The mail server could not be reached (it refused the connection).");
    expect(plainMailError(wrapped({ code: "ETIMEDOUT" }))).toBe("The connection to the mail server failed or timed out.");
    expect(plainMailError(wrapped({ code: "EAUTH" }))).toMatch(/did not accept Cloche's sign-in/);
    expect(plainMailError(wrapped({ code: "EENVELOPE", responseCode: 550, response: "550 5.1.1 No such mailbox\r\nmore" }))).toBe(
      "The mail server refused the message (550: 550 5.1.1 No such mailbox).",
    );
    expect(plainMailError(new AppError("unavailable", "E-mail is not set up on this server (CLOCHE_SMTP_URL), so nothing was sent."))).toBe(
      "E-mail is not set up on this server (CLOCHE_SMTP_URL), so nothing was sent.",
    );
    expect(plainMailError(new Error("boom\n    at x"))).toBe("The e-mail could not be sent.");
  });

  it("tell a refused message from a server out of reach", () => {
    expect(refusedThisMessage(wrapped({ responseCode: 550 }))).toBe(true);
    expect(refusedThisMessage(wrapped({ responseCode: 451 }))).toBe(false);
    expect(refusedThisMessage(wrapped({ code: "ESOCKET", originalCode: "ECONNREFUSED" }))).toBe(false);
  });
});
