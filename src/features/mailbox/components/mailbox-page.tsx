import { Link, NavLink, useParams } from 'react-router-dom';
import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { errorMessage } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { useMailMessage } from '../api/get-mail-message';
import { useMailMessages } from '../api/get-mail-messages';
import { TextWithLinks } from './text-with-links';

export default function MailboxPage() {
  const { messageId } = useParams();
  const messages = useMailMessages();

  return (
    <>
      <PageHeader
        title="Mailbox"
        lead="Mail this Rejectra server sent while running with its local mail stand-in: invitations and password resets land here instead of real inboxes. With an SMTP server configured, this page is not shown."
      />
      {messages.isPending && <LoadingState label="Loading received mail…" />}
      {messages.isError && (
        <ErrorState
          title="Received mail could not be loaded"
          message={errorMessage(messages.error)}
          onRetry={() => messages.refetch()}
        />
      )}
      {messages.isSuccess && messages.data.messages.length === 0 && (
        <EmptyState title="No mail received yet" icon={<EnvelopeIcon />}>
          <p>
            When a lead invites someone or a person asks for a password reset, the e-mail appears here, newest first,
            with its link ready to follow.
          </p>
        </EmptyState>
      )}
      {messages.isSuccess && messages.data.messages.length > 0 && (
        <div className="grid gap-6 xl:grid-cols-[minmax(20rem,2fr)_3fr]">
          <nav aria-label="Received messages" className="overflow-hidden rounded-lg border border-ink-200 bg-white">
            <ul className="divide-y divide-ink-100">
              {messages.data.messages.map((message) => (
                <li key={message.id}>
                  <NavLink
                    to={`/mailbox/${encodeURIComponent(message.id)}`}
                    className={({ isActive }) =>
                      `block px-4 py-3 hover:bg-trace-50 ${isActive ? 'bg-trace-100 shadow-[inset_4px_0_0_var(--color-trace-600)]' : ''}`
                    }
                  >
                    <span className="block font-medium text-ink-900">{message.subject}</span>
                    <span className="mt-0.5 flex flex-wrap justify-between gap-x-4 text-[0.9375rem] text-ink-600">
                      <span>To {message.to}</span>
                      <time dateTime={message.receivedAt} className="tabular">
                        {formatDateTime(message.receivedAt)}
                      </time>
                    </span>
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div>
            {messageId ? (
              <MessageView messageId={messageId} />
            ) : (
              <p className="rounded-lg border border-dashed border-ink-300 bg-white p-6 text-ink-700">
                Choose a message to read it.
              </p>
            )}
          </div>
        </div>
      )}
    </>
  );
}

function MessageView({ messageId }: { messageId: string }) {
  const message = useMailMessage(messageId);
  if (message.isPending) return <LoadingState label="Opening the message…" />;
  if (message.isError) {
    return (
      <ErrorState
        title="This message could not be opened"
        message={errorMessage(message.error)}
        onRetry={() => message.refetch()}
      />
    );
  }
  const { data } = message;
  return (
    <article aria-labelledby="message-subject" className="rounded-lg border border-ink-200 bg-white">
      <header className="border-b border-ink-200 px-5 py-4">
        <h2 id="message-subject" className="text-xl font-semibold text-ink-900">
          {data.subject}
        </h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-[0.9375rem]">
          <dt className="text-ink-600">From</dt>
          <dd className="text-ink-900">{data.from}</dd>
          <dt className="text-ink-600">To</dt>
          <dd className="text-ink-900">{data.to}</dd>
          <dt className="text-ink-600">Received</dt>
          <dd className="tabular text-ink-900">{formatDateTime(data.receivedAt)}</dd>
        </dl>
      </header>
      <div className="px-5 py-4 leading-relaxed break-words whitespace-pre-wrap text-ink-900">
        <TextWithLinks text={data.text} />
      </div>
      <footer className="border-t border-ink-100 px-5 py-3 text-[0.9375rem] text-ink-600">
        Shown as plain text. <Link to="/mailbox" className="text-trace-700 underline underline-offset-2">Close message</Link>
      </footer>
    </article>
  );
}

function EnvelopeIcon() {
  return (
    <svg viewBox="0 0 48 48" className="h-12 w-12" aria-hidden="true">
      <rect x="6" y="11" width="36" height="26" rx="3" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <path d="m7 13 17 13 17-13" fill="none" stroke="currentColor" strokeWidth="2.5" strokeLinejoin="round" />
    </svg>
  );
}
