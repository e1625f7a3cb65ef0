import { splitLinks } from '../../../lib/split-links';

/** A plain-text body with its URLs as links; nothing in the text is interpreted as HTML. */
export function TextWithLinks({ text }: { text: string }) {
  return (
    <>
      {splitLinks(text).map((segment, index) =>
        segment.kind === 'link' ? (
          <a
            key={index}
            href={segment.href}
            className="break-all font-medium text-trace-700 underline underline-offset-2 hover:text-trace-800"
          >
            {segment.text}
          </a>
        ) : (
          <span key={index}>{segment.text}</span>
        ),
      )}
    </>
  );
}
