import { Fragment } from "react";
import type { OutboxMessage } from "../api/get-outbox";

const URL_PATTERN = /(https?:\/\/[^\s<>"')\]]+)/g;

/** Renders plain text with its http(s) URLs as links; nothing is parsed as HTML. */
export function LinkifiedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <>
      {parts.map((part, index) =>
        index % 2 === 1 ? (
          <a
            key={index}
            href={part}
            className="break-all text-amber-strong underline decoration-amber underline-offset-2 hover:text-ink"
          >
            {part}
          </a>
        ) : (
          <Fragment key={index}>{part}</Fragment>
        ),
      )}
    </>
  );
}

/** Plain text of a message; an HTML-only body is reduced to text with each link's address kept. */
export function messageText(message: Pick<OutboxMessage, "text" | "html">): string {
  if (message.text) return message.text;
  if (!message.html) return "";
  const doc = new DOMParser().parseFromString(message.html, "text/html");
  for (const anchor of Array.from(doc.querySelectorAll("a[href]"))) {
    const href = anchor.getAttribute("href") ?? "";
    if (href && anchor.textContent !== href) anchor.append(` (${href})`);
  }
  return (doc.body.textContent ?? "").replace(/\n{3,}/g, "\n\n").trim();
}
