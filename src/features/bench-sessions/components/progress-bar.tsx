import type { UploadProgress } from '../../../lib/upload-with-progress';

/** Upload progress as a bar and in words; after the last byte the server still reads and checks the file. */
export function ProgressBar({ progress, label }: { progress: UploadProgress; label: string }) {
  const fraction = progress.totalBytes > 0 ? progress.sentBytes / progress.totalBytes : 0;
  const percent = Math.round(fraction * 100);
  const sent = progress.totalBytes > 0 && progress.sentBytes >= progress.totalBytes;
  return (
    <div className="space-y-1.5">
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        className="h-3 w-full overflow-hidden rounded-full border border-ink-300 bg-ink-50"
      >
        <div className="h-full bg-trace-600 transition-[width]" style={{ width: `${percent}%` }} />
      </div>
      <p className="text-[0.9375rem] text-ink-700">
        {sent ? (
          'Sent; the server is checking and storing the data…'
        ) : (
          <>
            Sending <span className="tabular">{percent} %</span>
            {progress.totalBytes > 0 && (
              <>
                {' '}
                of <span className="tabular">{(progress.totalBytes / 1024).toFixed(0)} KB</span>
              </>
            )}
          </>
        )}
      </p>
    </div>
  );
}
