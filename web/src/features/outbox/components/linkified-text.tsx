import { Fragment } from "react";

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
