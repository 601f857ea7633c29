import clsx from "clsx";
import { Link, useSearchParams } from "react-router-dom";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { paths } from "../../../config/paths";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useOutbox, type OutboxMessage } from "../api/get-outbox";
import { LinkifiedText, messageText } from "./linkified-text";

export function OutboxView() {
  const outbox = useOutbox();
  const [params] = useSearchParams();
  const messages = [...outbox.data.items].sort((a, b) => Date.parse(b.createdAt) - Date.parse(a.createdAt));
  const selected = messages.find((m) => String(m.id) === params.get("message")) ?? messages[0];

  if (!selected) {
    return (
      <EmptyState title="No e-mail captured yet" action={<Button size="sm" onClick={() => void outbox.refetch()}>Check again</Button>}>
        Invitations, password resets and run notices appear here instead of being sent.
      </EmptyState>
    );
  }

  return (
    <div className="grid min-h-[28rem] grid-cols-[minmax(16rem,22rem)_1fr] overflow-hidden rounded-lg border border-rule bg-paper-raised">
      <div className="flex min-w-0 flex-col border-r border-rule">
        <div className="flex items-center justify-between border-b border-rule px-3 py-2">
          <p className="text-xs font-semibold tracking-wide text-ink-muted uppercase">
            Captured <span className="num">{messages.length}</span>
          </p>
          <Button size="sm" variant="quiet" busy={outbox.isFetching} onClick={() => void outbox.refetch()}>
            Refresh
          </Button>
        </div>
        <ul aria-label="Captured e-mails" className="flex-1 divide-y divide-rule overflow-y-auto">
          {messages.map((message) => (
            <li key={message.id}>
              <MessageLink message={message} active={message.id === selected.id} />
            </li>
          ))}
        </ul>
      </div>
      <MessageBody message={selected} />
    </div>
  );
}

function MessageLink({ message, active }: { message: OutboxMessage; active: boolean }) {
  return (
    <Link
      to={paths.app.outbox.getHref(message.id)}
      aria-current={active ? "true" : undefined}
      className={clsx(
        "block border-l-2 px-3 py-2.5",
        active ? "border-amber bg-amber-soft/50" : "border-transparent hover:bg-paper-sunken",
      )}
    >
      <span className="block truncate text-[0.8125rem] font-medium text-ink">{message.subject}</span>
      <span className="mt-0.5 flex items-center justify-between gap-2 text-xs text-ink-muted">
        <span className="truncate">{message.to}</span>
        <time className="num shrink-0" dateTime={isoOrEmpty(message.createdAt)}>
          {formatDateTime(message.createdAt)}
        </time>
      </span>
    </Link>
  );
}

function MessageBody({ message }: { message: OutboxMessage }) {
  return (
    <article aria-labelledby="outbox-subject" className="flex min-w-0 flex-col">
      <header className="border-b border-rule px-5 py-3">
        <h2 id="outbox-subject" className="text-base font-semibold text-ink">
          {message.subject}
        </h2>
        <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-[0.8125rem]">
          <dt className="text-ink-muted">From</dt>
          <dd className="text-ink">{message.from}</dd>
          <dt className="text-ink-muted">To</dt>
          <dd className="text-ink">{message.to}</dd>
          <dt className="text-ink-muted">Captured</dt>
          <dd className="num text-ink">
            <time dateTime={isoOrEmpty(message.createdAt)}>{formatDateTime(message.createdAt)}</time>
          </dd>
        </dl>
      </header>
      <div className="flex-1 overflow-auto px-5 py-4 text-sm leading-relaxed whitespace-pre-wrap text-ink">
        <LinkifiedText text={messageText(message)} />
      </div>
    </article>
  );
}
